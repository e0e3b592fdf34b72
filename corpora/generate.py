#!/usr/bin/python3
"""Generates chute's demo corpus: the inbound correspondence of the invented
"Harbour Authority of Port Velmar".

Everything in it is invented: the port, people, ships, companies, streets,
laws and reference numbers. Documents are assembled from templates: each
slot (subject, opening, details, request, closing, signature, ...) has many
phrase variants, and "[a|b|c]" inside a phrase picks one alternative, so
documents are combinations, not copies. A phrase may start with tags,
"book,eta::..." (fits only documents whose opening set one of those
scenarios) or "!cancel::..." (fits all but that one), so that the sentences
of one document stay on one matter. About one document in ten is in
Spanish, German or Japanese; a share carries typing mistakes, scanned
letters and faxes carry OCR-like noise, and some mention other queues'
business so that routing them is not trivial.

Output (under --out, default corpora/port-authority next to this script):
  labelled/<queue>/<NNNN>.txt   documents with their queue
  inbox/<name>.txt              unlabelled documents from the same generator
  inbox-key.csv                 RFC 4180 CSV, header path,queue
  README.md                     scenario, counts, languages, noise, command

The output is a pure function of the seed: re-running with the same seed
rewrites the same bytes (the script removes labelled/, inbox/ and
inbox-key.csv first, and uses no clock, no hash ordering, no locale).

Usage: corpora/generate.py [--seed N] [--out DIR]
Standard library only.
"""

import argparse
import csv
import datetime
import io
import os
import random
import re
import shutil
import sys
import textwrap
import unicodedata

SEED = 20261130

# Queues: (name, labelled documents, inbox documents, share of senders who
# write as private persons rather than for a company). The intake is skewed
# on purpose: the largest queue has eight times the documents of the smallest.
QUEUES = [
    ("berth-bookings", 160, 32, 0.05),
    ("billing", 95, 19, 0.20),
    ("cargo-customs", 70, 14, 0.10),
    ("marina", 45, 9, 0.90),
    ("environment", 34, 7, 0.85),
    ("security-incidents", 28, 6, 0.50),
    ("records-requests", 24, 5, 0.70),
    ("careers", 20, 4, 1.00),
]

QUEUE_PURPOSE = {
    "berth-bookings": "vessel berth, pilotage and tug requests, ETA changes, cancellations",
    "billing": "invoices, harbour dues disputes, refunds, payments, account changes",
    "cargo-customs": "manifests, customs holds, dangerous goods declarations, cargo release",
    "marina": "leisure moorings, yacht permits, visitor berths, waiting list",
    "environment": "oil sheens, noise, dust, dredging and pollution complaints",
    "security-incidents": "access badges, thefts, trespass, gates, suspicious activity",
    "records-requests": "requests for documents held by the Authority",
    "careers": "job applications and enquiries about vacancies",
}

# Queues whose business a document of the key queue plausibly mentions in
# passing (a billing dispute names a berth, a theft happens at the marina).
# Records requests and job applications borrow other queues' words through
# what they ask for and what the applicant has done instead.
MENTIONS = {
    "berth-bookings": ["billing", "cargo-customs"],
    "billing": ["berth-bookings", "cargo-customs", "marina"],
    "cargo-customs": ["berth-bookings", "billing", "security-incidents"],
    "marina": ["billing", "security-incidents", "environment", "careers"],
    "environment": ["berth-bookings", "marina", "cargo-customs", "records-requests"],
    "security-incidents": ["marina", "berth-bookings", "cargo-customs", "records-requests"],
    "records-requests": [],
    "careers": [],
}

# Second matters that the same sender plausibly raises in one document (an
# agent books a berth and disputes last call's invoice). Such a document
# belongs to the queue of its first, longer matter.
SECOND_MATTER = {
    "berth-bookings": ["billing", "cargo-customs"],
    "billing": ["berth-bookings", "cargo-customs", "marina"],
    "cargo-customs": ["billing", "berth-bookings"],
    "marina": ["billing", "security-incidents"],
    "environment": ["marina", "records-requests"],
    "security-incidents": ["marina", "cargo-customs"],
    "records-requests": ["environment", "security-incidents"],
    "careers": [],
}

# Share of non-English documents per queue, and how they split.
FOREIGN_SHARE = 0.10
FOREIGN_LANGS = ["es", "de", "ja"]
LANG_NAMES = {"en": "English", "es": "Spanish", "de": "German", "ja": "Japanese"}

# Difficulty knobs (probabilities per document).
P_MENTION = 0.55     # one passing sentence about another queue's business
P_MIXED_LABELLED = 0.04  # document about two matters, labelled by the first
P_MIXED_INBOX = 0.12     # the same in the inbox: the harder cases
P_TYPOS = 0.25       # typed documents with typing mistakes
P_FOREIGN_SENDER = 0.15  # English documents written by a Spanish, German or Japanese sender

AUTHORITY = "Harbour Authority of Port Velmar"
AUTHORITY_ADDRESS = ["Harbour House", "1 Quay Parade", "Port Velmar PV1 2HA"]
AUTHORITY_MAILBOXES = ["enquiries@portvelmar.example", "info@portvelmar.example",
                       "harbourmaster@portvelmar.example", "office@portvelmar.example",
                       "enquiries@portvelmar.example", "reception@portvelmar.example"]

FIRST_DAY = datetime.date(2026, 8, 3)
LAST_DAY = datetime.date(2026, 12, 18)


# ---------------------------------------------------------------------------
# Template expansion

ALTERNATIVE = re.compile(r"\[([^\[\]]*)\]")
FIELD = re.compile(r"\{([a-z_0-9]+)\}")


def split_tags(item):
    """'book,eta::text' -> ({'book','eta'}, set(), 'text'); '!cancel::text'
    -> (None, {'cancel'}, 'text'); untagged -> (None, set(), text). Tags keep
    the sentences of one document on one scenario (a cancellation does not
    ask for a pilot)."""
    if "::" not in item:
        return None, set(), item
    head, text = item.split("::", 1)
    names = head.split(",")
    allow = {n for n in names if not n.startswith("!")} or None
    deny = {n[1:] for n in names if n.startswith("!")}
    return allow, deny, text


def fits(item, scenario):
    allow, deny, _ = split_tags(item)
    if scenario is None:
        return True
    return scenario not in deny and (allow is None or scenario in allow)


def choose(rng, items, scenario, count=None):
    """Picks one item (or count distinct items) that fit the scenario."""
    pool = [i for i in items if fits(i, scenario)]
    if not pool:
        pool = [i for i in items if split_tags(i)[0] is None] or list(items)
    if count is None:
        return split_tags(rng.choice(pool))[2]
    return [split_tags(i)[2] for i in rng.sample(pool, min(count, len(pool)))]


def scenario_of(item):
    allow = split_tags(item)[0]
    return sorted(allow)[0] if allow else None


def expand(ctx, text):
    """Replaces every innermost [a|b|...] by one alternative, then {field}s."""
    rng = ctx.rng
    while True:
        m = ALTERNATIVE.search(text)
        if not m:
            break
        text = text[:m.start()] + rng.choice(m.group(1).split("|")) + text[m.end():]
    text = FIELD.sub(lambda m: ctx.get(m.group(1)), text)
    text = re.sub(r"  +", " ", text).replace(" ,", ",").replace(" .", ".")
    return re.sub(r"\.\.(?!\.)", ".", text)  # "S.L." at the end of a sentence


# ---------------------------------------------------------------------------
# Invented entities

SHIP_A = ["Corran", "Velmar", "Aldersey", "Brackwater", "Isolde", "Halvard", "Sable",
          "Tessaly", "Oren", "Cormant", "Merrow", "Quillan", "Arden", "Lysander",
          "Norhaven", "Saltire", "Kestrel", "Ostwind", "Belcarra", "Ravelle", "Doranne",
          "Skerrow", "Marisol", "Fennick", "Torvald", "Calloway", "Ysolde", "Brenna",
          "Castellane", "Winterhope", "Aurigny", "Pellam"]
SHIP_B = ["Tide", "Star", "Spirit", "Trader", "Pioneer", "Dawn", "Venture", "Carrier",
          "Bay", "Express", "Horizon", "Grace", "Reach", "Mariner", "Breeze", "Crest",
          "Light", "Voyager", "Hope", "Runner", "Sound", "Endeavour"]
SHIP_PREFIX = ["MV ", "MV ", "MV ", "MS ", "MT ", "", ""]
YACHTS = ["Sea Wren", "Blue Marigold", "Pennyroyal", "Lark of Dunmere", "Moth",
          "Second Wind", "Tessa May", "Little Auk", "Wandering Gull", "Saltbox",
          "Fair Isla", "Bramble", "Kittiwake II", "Morwenna", "Sorrel", "Silver Fern",
          "Tern Again", "Ondine", "Mirabelle", "Puffin Rock", "Amberjack", "Skylark III",
          "Merganser", "Ottilie", "Dancing Tern", "Loblolly", "Ysella", "Half Tide",
          "Quiet Otter", "Brisk", "Windflower", "Cormorant's Rest", "Luma", "Petrel"]
PORTS = ["Corrasund", "Brennick", "Aramoor", "Lisvane Roads", "Tarragal", "Kestermünde",
         "Vallorca", "Nordvik Haven", "Saint Aubery", "Marrowhaven", "Oldenhavn",
         "Port Isquen", "Halmsund", "Caldera Bay", "Riverhythe", "Santa Ylena"]
QUAYS = ["North Mole", "Tessin Quay", "Coal Quay", "Ropewalk Wharf", "East Breakwater",
         "Customs Quay", "Old Fish Quay", "Container Terminal East", "Grain Pier",
         "Ferry Basin"]
STREETS = ["Quayside Row", "Lantern Street", "Old Ropewalk", "Saltmarsh Lane",
           "Harbour Parade", "Chandlers Yard", "Netmakers Close", "Tidewater Road",
           "Mill Slip", "Gull Terrace", "Customs House Lane", "Anchor Hill", "Beacon Road",
           "Sailmakers Walk", "Pilot Street", "Breakwater Crescent", "Tarry Lane"]
TOWNS = ["Port Velmar", "Port Velmar", "Port Velmar", "Dunmere", "Aramoor", "Brennick",
         "Marrowhaven", "Velmar Sands"]

EN_FIRST = ["Ada", "Bram", "Cerys", "Dmitri", "Elin", "Fergus", "Gwen", "Hamish", "Ines",
            "Jonah", "Kasia", "Lorcan", "Mairead", "Nils", "Olwen", "Priya", "Quentin",
            "Rosalind", "Soren", "Tamsin", "Ulrich", "Verity", "Wendell", "Yusuf", "Zora",
            "Callum", "Delphine", "Ewan", "Harriet", "Ivo", "Linnea", "Marcus", "Nadia",
            "Oscar", "Petra", "Rhys", "Sabine", "Tobias", "Una", "Viktor", "Bethan", "Declan"]
EN_LAST = ["Ardley", "Brisco", "Corvane", "Delacourt", "Eddington", "Fairweather",
           "Gallard", "Hesketh", "Ingram", "Jessop", "Kilbride", "Lockhart", "Marchbank",
           "Nettleford", "Oakhurst", "Penwarden", "Quarrie", "Rainsford", "Stavely",
           "Trelawney", "Underhill", "Varga", "Whitlock", "Yarrow", "Ashdown", "Bellweather",
           "Crowther", "Dunleavy", "Farrant", "Goodall", "Halloran", "Okafor", "Pryce",
           "Sandoval", "Thorne", "Vickery", "Wendover", "Mallory", "Tregarth", "Abernethy"]
ES_FIRST = ["Lucía", "Javier", "Marta", "Iñaki", "Carmen", "Alejandro", "Rocío", "Pablo",
            "Nerea", "Sergio", "Ainhoa", "Tomás", "Begoña", "Raúl"]
ES_LAST = ["Ferrán", "Oyarzábal", "Castrejón", "Llorente", "Ibarguren", "Valdemora",
           "Arriaga", "Sotomayor", "Elorrieta", "Quintana", "Montalvo", "Urquiza"]
DE_FIRST = ["Jörg", "Sabine", "Matthias", "Ulrike", "Henning", "Katrin", "Björn", "Anja",
            "Torsten", "Friederike", "Lars", "Dörte", "Meike", "Volker"]
DE_LAST = ["Albrecht", "Weißmann", "Hollmann", "Brinckmeyer", "Lührsen", "Oberdieck",
           "Steinhaus", "Kessler", "Wendt", "Jacobsen", "Rademacher", "Vogelsang",
           "Thießen", "Kruse"]
JA_LAST = ["田中", "佐藤", "鈴木", "高橋", "渡辺", "伊藤", "山本", "中村", "小林", "加藤",
           "吉田", "松本", "井上", "木村"]
JA_FIRST = ["誠", "恵子", "健一", "直美", "大輔", "美咲", "浩二", "由紀", "拓也", "裕子",
            "翔太", "智子"]
JA_LAST_ROMAN = {"田中": "Tanaka", "佐藤": "Sato", "鈴木": "Suzuki", "高橋": "Takahashi",
                 "渡辺": "Watanabe", "伊藤": "Ito", "山本": "Yamamoto", "中村": "Nakamura",
                 "小林": "Kobayashi", "加藤": "Kato", "吉田": "Yoshida", "松本": "Matsumoto",
                 "井上": "Inoue", "木村": "Kimura"}
JA_FIRST_ROMAN = {"誠": "Makoto", "恵子": "Keiko", "健一": "Kenichi", "直美": "Naomi",
                  "大輔": "Daisuke", "美咲": "Misaki", "浩二": "Koji", "由紀": "Yuki",
                  "拓也": "Takuya", "裕子": "Yuko", "翔太": "Shota", "智子": "Tomoko"}

EN_COMPANY_A = ["Castellane", "Orrin & Delby", "Marrowgate", "Tessin", "Quillan",
                "Halberd", "Norcastle", "Brisco", "Vantmoor", "Aldwick", "Corvane",
                "Dunmere", "Sallow", "Ferrant", "Lowmarsh", "Oakhythe", "Grisdale",
                "Estover", "Pellam & Rook", "Velmar Bay", "Saltreach", "Kittering"]
EN_COMPANY_B = ["Shipping", "Freight Lines", "Marine Services", "Logistics",
                "Shipping Agency", "Stevedoring", "Bulk Carriers", "Forwarding",
                "Ship Management", "Maritime", "Towage", "Tank Lines", "Ship Agents",
                "Customs Brokers", "Fish Traders", "Building Supplies"]
EN_AGENT_B = ["Shipping", "Shipping Agency", "Ship Agents", "Maritime", "Ship Management",
              "Marine Services", "Bulk Carriers", "Freight Lines"]
EN_COMPANY_C = ["Ltd", "Ltd", "Ltd", "plc", "& Co.", "Limited", ""]
ES_COMPANY = ["Naviera {x} S.A.", "Consignataria {x} S.L.", "Transportes Marítimos {x}",
              "Tránsitos {x} S.L.", "Agencia Marítima {x}", "Pesquerías {x} S.A."]
ES_COMPANY_X = ["Ferrán", "Arriaga", "Montoya Llorente", "Ibarguren", "Castrejón",
                "Valdemora", "Elorrieta", "Soler y Vidal", "del Sur Atlántico", "Urquiza"]
DE_COMPANY = ["{x} Reederei GmbH", "{x} Schiffahrts-KG", "{x} Logistik GmbH",
              "Spedition {x}", "{x} Schiffsmakler GmbH", "{x} Befrachtung GmbH & Co. KG"]
DE_COMPANY_X = ["Albrecht", "Kessler & Voss", "Hollmann", "Brinckmeyer", "Steinhaus",
                "Wendt", "Lührsen", "Oberdieck", "Nordmark", "Elbwerder"]
JA_COMPANY = ["{x}海運株式会社", "{x}マリン株式会社", "{x}ロジスティクス株式会社",
              "{x}汽船株式会社", "株式会社{x}商事", "{x}シッピング株式会社"]
JA_COMPANY_X = ["北浜", "青嶺", "白鷺", "港栄", "朝凪", "汐見", "瀬戸東", "浜風", "千鳥",
                "若潮"]
JA_COMPANY_ROMAN = {"北浜": "Kitahama", "青嶺": "Aomine", "白鷺": "Shirasagi",
                    "港栄": "Koei", "朝凪": "Asanagi", "汐見": "Shiomi", "瀬戸東": "Setohigashi",
                    "浜風": "Hamakaze", "千鳥": "Chidori", "若潮": "Wakashio"}

CLUBS = ["Velmar Sands Sailing Club", "Dunmere Cruising Association",
         "Port Velmar Yacht Club", "Aramoor Boat Owners' Club"]
RES_GROUPS = ["Ropewalk Residents' Association", "Friends of Velmar Foreshore",
              "Saltmarsh Lane Neighbourhood Group", "Velmar Estuary Watch"]
OUTLETS = ["the Velmar Gazette", "Coastline Weekly", "the Velmar Evening Post",
           "Harbour Voice (community radio)", "the Dunmere Courier", "Tidewater Review"]

UN_GOODS = {
    "en": ["UN 1263, paint, class 3", "UN 1830, sulphuric acid, class 8",
           "UN 3480, lithium ion batteries, class 9", "UN 2067, ammonium nitrate based fertiliser, class 5.1",
           "UN 1202, gas oil, class 3", "UN 1005, ammonia, anhydrous, class 2.3",
           "UN 3082, environmentally hazardous substance, liquid, n.o.s., class 9",
           "UN 1993, flammable liquid, n.o.s., class 3"],
    "es": ["UN 1263, pintura, clase 3", "UN 1830, ácido sulfúrico, clase 8",
           "UN 3480, baterías de ion litio, clase 9", "UN 1202, gasóleo, clase 3",
           "UN 3082, sustancia peligrosa para el medio ambiente, líquida, n.e.p., clase 9"],
    "de": ["UN 1263, Farbe, Klasse 3", "UN 1830, Schwefelsäure, Klasse 8",
           "UN 3480, Lithium-Ionen-Batterien, Klasse 9", "UN 1202, Gasöl, Klasse 3",
           "UN 3082, umweltgefährdender Stoff, flüssig, n.a.g., Klasse 9"],
    "ja": ["UN 1263（塗料、クラス3）", "UN 1830（硫酸、クラス8）",
           "UN 3480（リチウムイオン電池、クラス9）", "UN 1202（軽油、クラス3）",
           "UN 3082（環境有害物質、液体、クラス9）"],
}
CARGO = {
    "en": ["steel coils", "sawn timber", "wheat", "fertiliser", "scrap metal", "cement",
           "wind turbine blades", "frozen fish", "animal feed", "road salt", "kaolin",
           "project cargo", "aggregates", "wood pellets", "paper reels", "used cars"],
    "es": ["bobinas de acero", "madera aserrada", "trigo", "fertilizantes", "chatarra",
           "cemento", "palas de aerogenerador", "pescado congelado", "pienso", "sal"],
    "de": ["Stahlcoils", "Schnittholz", "Weizen", "Düngemittel", "Schrott", "Zement",
           "Rotorblätter", "Tiefkühlfisch", "Futtermittel", "Streusalz", "Holzpellets"],
    "ja": ["鋼材コイル", "製材", "小麦", "肥料", "スクラップ", "セメント", "風車ブレード",
           "冷凍魚", "飼料", "木質ペレット", "紙ロール"],
}
POSITIONS = {
    "en": ["Deck Hand (Pilot Launch)", "Marine Pilot", "Pilot Boat Coxswain",
           "Harbour Patrol Officer", "Port Security Officer",
           "Finance Assistant (Accounts Receivable)", "Marina Assistant",
           "Environmental Officer", "Berth Planner", "Customs Liaison Clerk",
           "Crane Operator", "Mooring Linesman", "Records and Information Officer",
           "Marine Engineer", "Dredger Mate", "Receptionist"],
    "es": ["marinero de la lancha de prácticos", "agente de seguridad portuaria",
           "auxiliar de facturación", "técnico de medio ambiente", "operador de grúa",
           "auxiliar de la marina deportiva", "planificador de atraques"],
    "de": ["Decksmann (Lotsenversetzboot)", "Sicherheitsmitarbeiter Hafen",
           "Sachbearbeiter Buchhaltung", "Umweltreferent", "Kranführer",
           "Mitarbeiter Yachthafen", "Liegeplatzdisponent"],
    "ja": ["パイロットボート甲板員", "港湾保安職員", "経理事務（請求担当）", "環境担当職員",
           "クレーンオペレーター", "マリーナスタッフ", "バース計画担当"],
}
MONTHS = {
    "en": ["January", "February", "March", "April", "May", "June", "July", "August",
           "September", "October", "November", "December"],
    "es": ["enero", "febrero", "marzo", "abril", "mayo", "junio", "julio", "agosto",
           "septiembre", "octubre", "noviembre", "diciembre"],
    "de": ["Januar", "Februar", "März", "April", "Mai", "Juni", "Juli", "August",
           "September", "Oktober", "November", "Dezember"],
}
EN_DAYS = ["Mon", "Tue", "Wed", "Thu", "Fri", "Sat", "Sun"]
EN_MONTHS_SHORT = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct",
                   "Nov", "Dec"]


def money(ctx, value):
    whole = f"{value:,.2f}"
    lang = ctx.lang
    if lang == "en":
        return ctx.rng.choice(["EUR {}", "€{}", "{} euros", "EUR {}"]).format(whole)
    if lang == "ja":
        return whole + "ユーロ"
    european = whole.replace(",", "_").replace(".", ",").replace("_", ".")
    return european + ctx.rng.choice([" €", " EUR", " euros" if lang == "es" else " Euro"])


def fmt_date(ctx, day):
    lang, style = ctx.lang, ctx.date_style
    if lang == "en":
        if style == 0:
            return f"{day.day} {MONTHS['en'][day.month - 1]} {day.year}"
        if style == 1:
            return f"{day.day:02d}/{day.month:02d}/{day.year}"
        if style == 2:
            return f"{day.day} {EN_MONTHS_SHORT[day.month - 1]}"
        return day.isoformat()
    if lang == "es":
        if style in (0, 2):
            return f"{day.day} de {MONTHS['es'][day.month - 1]}"
        return f"{day.day:02d}/{day.month:02d}/{day.year}"
    if lang == "de":
        if style in (0, 2):
            return f"{day.day}. {MONTHS['de'][day.month - 1]} {day.year}"
        return f"{day.day:02d}.{day.month:02d}.{day.year}"
    if style in (0, 2):
        return f"{day.month}月{day.day}日"
    return f"{day.year}年{day.month}月{day.day}日"


def person(rng, origin):
    if origin == "es":
        return f"{rng.choice(ES_FIRST)} {rng.choice(ES_LAST)} {rng.choice(ES_LAST)}"
    if origin == "de":
        return f"{rng.choice(DE_FIRST)} {rng.choice(DE_LAST)}"
    if origin == "ja":
        return f"{rng.choice(JA_LAST)} {rng.choice(JA_FIRST)}"
    return f"{rng.choice(EN_FIRST)} {rng.choice(EN_LAST)}"


def roman(name):
    """Latin spelling of a Japanese name, given-name first, for English text."""
    parts = name.split(" ")
    if len(parts) == 2 and parts[0] in JA_LAST_ROMAN:
        return f"{JA_FIRST_ROMAN[parts[1]]} {JA_LAST_ROMAN[parts[0]]}"
    return name


def company(rng, origin, shipping=False):
    if origin == "en" and shipping:
        return " ".join(p for p in (rng.choice(EN_COMPANY_A), rng.choice(EN_AGENT_B),
                                    rng.choice(EN_COMPANY_C)) if p)
    if origin == "es":
        return rng.choice(ES_COMPANY).format(x=rng.choice(ES_COMPANY_X))
    if origin == "de":
        return rng.choice(DE_COMPANY).format(x=rng.choice(DE_COMPANY_X))
    if origin == "ja":
        return rng.choice(JA_COMPANY).format(x=rng.choice(JA_COMPANY_X))
    return " ".join(p for p in (rng.choice(EN_COMPANY_A), rng.choice(EN_COMPANY_B),
                                rng.choice(EN_COMPANY_C)) if p)


def company_latin(name):
    """A company name usable in an e-mail domain."""
    for x, r in JA_COMPANY_ROMAN.items():
        if x in name:
            return r + "-kaiun"
    return name


def domain_of(name):
    base = company_latin(name).lower()
    for a, b in (("ä", "ae"), ("ö", "oe"), ("ü", "ue"), ("ß", "ss"), ("á", "a"),
                 ("é", "e"), ("í", "i"), ("ó", "o"), ("ú", "u"), ("ñ", "n")):
        base = base.replace(a, b)
    words = [w for w in re.split(r"[^a-z0-9]+", base)
             if w and w not in ("ltd", "plc", "co", "limited", "gmbh", "kg", "s", "a", "l",
                                "y", "del", "und", "and")]
    return "".join(words[:2]) + ".example"


def mailbox_of(name):
    plain = name
    for a, b in (("ä", "ae"), ("ö", "oe"), ("ü", "ue"), ("ß", "ss"), ("á", "a"),
                 ("é", "e"), ("í", "i"), ("ó", "o"), ("ú", "u"), ("ñ", "n")):
        plain = plain.lower().replace(a, b)
    parts = re.findall(r"[a-z]+", plain)
    return parts


def phone(rng):
    return rng.choice(["(0712) {} {} {}", "+99 712 {} {}{}", "0712 {}{}{}", "07{}{}{}"]).format(
        rng.randint(100, 999), rng.randint(10, 99), rng.randint(10, 99))


class Ctx:
    """The facts of one document, drawn lazily so that a field used twice
    (the ship, the invoice number) reads the same both times."""

    def __init__(self, rng, lang, when):
        self.rng = rng
        self.lang = lang
        self.when = when
        self.date_style = rng.randrange(4)
        self.values = {}

    def get(self, key):
        if key not in self.values:
            fn = FIELDS.get(key)
            if fn is None:
                raise KeyError(f"template uses unknown field {{{key}}}")
            self.values[key] = fn(self)
        return self.values[key]

    def set(self, key, value):
        self.values[key] = value


def _past(c, lo=1, hi=35):
    return c.when - datetime.timedelta(days=c.rng.randint(lo, hi))


def _future(c, lo=2, hi=25):
    return c.when + datetime.timedelta(days=c.rng.randint(lo, hi))


def _ship(c):
    name = f"{c.rng.choice(SHIP_A)} {c.rng.choice(SHIP_B)}"
    return (c.rng.choice(SHIP_PREFIX) if c.lang == "en" else "") + name


def _berth(c):
    n = c.rng.randint(1, 14)
    return {"en": f"Berth {n}", "es": f"atraque {n}", "de": f"Liegeplatz {n}",
            "ja": f"第{n}バース"}[c.lang]


def _berth2(c):
    first = c.get("berth")
    while True:
        other = _berth(c)
        if other != first:
            return other


def _pontoon(c):
    letter = c.rng.choice("ABCDEFG")
    return {"en": f"Pontoon {letter}", "es": f"pantalán {letter}", "de": f"Steg {letter}",
            "ja": f"{letter}桟橋"}[c.lang]


def _gate(c):
    n = c.rng.randint(1, 6)
    return {"en": f"Gate {n}", "es": f"puerta {n}", "de": f"Tor {n}", "ja": f"第{n}ゲート"}[c.lang]


def _position(c):
    return c.rng.choice(POSITIONS[c.lang])


def _month(c):
    d = c.when + datetime.timedelta(days=c.rng.choice([-60, -30, 30, 60, 90]))
    if c.lang == "ja":
        return f"{d.month}月"
    return MONTHS[c.lang][d.month - 1]


def _container(c):
    owner = c.rng.choice(["VLMU", "CSTU", "HBDU", "TRGU", "OKRU", "NVHU"])
    return f"{owner} {c.rng.randint(100000, 999999)} {c.rng.randint(0, 9)}"


def _person_any(c):
    origin = c.lang if c.lang != "en" else "en"
    return person(c.rng, origin)


def _agent(c):
    return company(c.rng, c.lang, shipping=True)


FIELDS = {
    "ship": _ship,
    "ship2": _ship,
    "yacht": lambda c: c.rng.choice(YACHTS),
    "company": lambda c: c.get("sender_company") or _agent(c),
    "agent": _agent,
    "name": lambda c: c.get("sender_name"),
    "name2": _person_any,
    "date": lambda c: fmt_date(c, _past(c)),
    "date2": lambda c: fmt_date(c, _past(c, 1, 3)),
    "fdate": lambda c: fmt_date(c, _future(c)),
    "fdate2": lambda c: fmt_date(c, _future(c, 26, 40)),
    "month": _month,
    "fmonth": _month,
    "year": lambda c: str(c.rng.randint(2019, 2025)),
    "year2": lambda c: "2026",
    "time": lambda c: f"{c.rng.randint(0, 23):02d}:{c.rng.choice([0, 0, 15, 30, 45]):02d}",
    "berth": _berth,
    "berth2": _berth2,
    "quay": lambda c: c.rng.choice(QUAYS),
    "street": lambda c: c.rng.choice(STREETS),
    "port": lambda c: c.rng.choice(PORTS),
    "port2": lambda c: c.rng.choice(PORTS),
    "pontoon": _pontoon,
    "mooring": lambda c: f"{c.rng.choice('ABCDEFG')}-{c.rng.randint(1, 48)}",
    "gate": _gate,
    "imo": lambda c: str(c.rng.randint(9100000, 9899999)),
    "loa": lambda c: str(c.rng.choice([89.9, 99.95, 118.5, 139.6, 149.9, 169.3, 180.0, 189.99, 82.5, 124.0])),
    "beam": lambda c: str(c.rng.choice([12.5, 15.2, 16.5, 20.4, 23.0, 28.4, 30.2, 32.26])),
    "draft": lambda c: f"{c.rng.uniform(4.2, 11.8):.1f}",
    "depth": lambda c: f"{c.rng.uniform(7.0, 13.0):.1f}",
    "gt": lambda c: f"{c.rng.randint(1800, 42000):,}",
    "gt2": lambda c: f"{c.rng.randint(1800, 42000):,}",
    "qty": lambda c: f"{c.rng.randint(8, 320) * 50:,}",
    "hours": lambda c: str(c.rng.randint(6, 60)),
    "ntugs": lambda c: str(c.rng.choice([1, 2, 2, 3])),
    "n": lambda c: str(c.rng.randint(2, 9)),
    "cargo": lambda c: c.rng.choice(CARGO[c.lang]),
    "un": lambda c: c.rng.choice(UN_GOODS[c.lang]),
    "container": _container,
    "voy": lambda c: f"{c.rng.randint(1, 52):02d}{c.rng.choice('NSEW')}",
    "bl": lambda c: f"{c.rng.choice(['VLM', 'CST', 'NHV', 'ARM'])}{c.rng.randint(1000000, 9999999)}",
    "npkg": lambda c: str(c.rng.randint(4, 480)),
    "kg": lambda c: f"{c.rng.randint(300, 26000):,}",
    "hs": lambda c: f"{c.rng.randint(1000, 9999)} {c.rng.randint(10, 99)} {c.rng.randint(10, 99)}",
    "hs2": lambda c: f"{c.rng.randint(1000, 9999)} {c.rng.randint(10, 99)} {c.rng.randint(10, 99)}",
    "seal": lambda c: f"{c.rng.choice(['VS', 'PV', 'HS'])}{c.rng.randint(100000, 999999)}",
    "temp": lambda c: str(c.rng.choice([-25, -18, -20, 2, 4, 13])),
    "mrn": lambda c: f"26PV{c.rng.randint(10**13, 10**14 - 1)}",
    "amount": lambda c: money(c, c.rng.randint(12000, 4800000) / 100),
    "amount2": lambda c: money(c, c.rng.randint(9000, 3900000) / 100),
    "amount3": lambda c: money(c, c.rng.randint(2500, 90000) / 100),
    "rate": lambda c: f"{c.rng.randint(18, 64) / 100:.2f}",
    "rate2": lambda c: f"{c.rng.randint(18, 64) / 100:.2f}",
    "po": lambda c: f"PO-{c.rng.randint(40000, 99999)}",
    "payref": lambda c: f"{c.rng.choice(['TRF', 'PAY', 'SW'])}{c.rng.randint(100000, 999999)}",
    "vat": lambda c: f"PV{c.rng.randint(100000000, 999999999)}",
    "iban": lambda c: f"PV{c.rng.randint(10, 99)} VLMB {c.rng.randint(1000, 9999)} {c.rng.randint(1000, 9999)} {c.rng.randint(1000, 9999)} {c.rng.randint(10, 99)}",
    "custno": lambda c: f"C{c.rng.randint(10000, 99999)}",
    "ref_bb": lambda c: f"BB-2026-{c.rng.randint(1000, 9999):05d}",
    "ref_inv": lambda c: f"{c.rng.choice(['INV', 'INV', 'HD', 'SI'])}-26-{c.rng.randint(100000, 199999)}",
    "ref_cc": lambda c: f"{c.rng.choice(['CL', 'CE'])}-{c.rng.randint(20000, 89999)}",
    "ref_mar": lambda c: f"MAR/{c.rng.choice(['WL', 'SM', 'VB', 'PR'])}/{c.rng.randint(100, 999):04d}",
    "ref_env": lambda c: f"ENV-26-{c.rng.randint(100, 799):04d}",
    "ref_sec": lambda c: f"SEC-26-{c.rng.randint(100, 999):04d}",
    "ref_rr": lambda c: f"RR-2026-{c.rng.randint(10, 240):03d}",
    "ref_hr": lambda c: f"HR-VAC-26-{c.rng.randint(1, 40):03d}",
    "ref_own": lambda c: f"{c.rng.choice(['OPS', 'ACC', 'DOC', 'PV', 'VEL'])}/{c.rng.randint(1000, 9999)}",
    "yachtlen": lambda c: f"{c.rng.uniform(6.5, 18.5):.1f}",
    "ydraft": lambda c: f"{c.rng.uniform(0.8, 2.4):.1f}",
    "ybeam": lambda c: f"{c.rng.uniform(2.4, 5.6):.1f}",
    "mast": lambda c: f"{c.rng.randint(9, 22)}",
    "wlyear": lambda c: str(c.rng.randint(2019, 2025)),
    "club": lambda c: c.rng.choice(CLUBS),
    "resgroup": lambda c: c.rng.choice(RES_GROUPS),
    "outlet": lambda c: c.rng.choice(OUTLETS),
    "size": lambda c: str(c.rng.choice([20, 30, 50, 100, 200, 300])),
    "db": lambda c: str(c.rng.randint(62, 94)),
    "badge": lambda c: f"PV-{c.rng.randint(1000, 99999):05d}",
    "polref": lambda c: f"VP/{c.rng.randint(1000, 9999)}/26",
    "hp": lambda c: str(c.rng.choice([2.5, 4, 6, 9.9, 15, 20, 40, 60])),
    "serial": lambda c: f"{c.rng.choice(['1B', '3F', '6A', '0K'])}{c.rng.randint(100000, 999999)}",
    "plate": lambda c: f"{c.rng.choice(['PV', 'DM', 'AR'])}{c.rng.randint(10, 99)} {''.join(c.rng.choice('ABCDEFGHJKLMNPRSTUVWXYZ') for _ in range(3))}",
    "ndays": lambda c: c.rng.choice(["20", "20", "15", "30"]),
    "salary": lambda c: money(c, c.rng.randint(24, 58) * 1000),
    "phone": lambda c: phone(c.rng),
    "position": _position,
    "sender_name": _person_any,
    "sender_company": lambda c: None,
}


# ---------------------------------------------------------------------------
# Phrase banks. Per language and queue: subject lines, openings (say what the
# document is about), details, requests, passing mentions (used in other
# queues' documents) and, in English, the Authority's replies that e-mails
# quote.

EN = {
    "berth-bookings": {
        "subject": [
            "book,eta::Berth request {ship} ETA {fdate}",
            "book,avail::[Berth|Berthing] [application|request] – {ship}",
            "pilot,book::Pilotage request for {ship}, [inbound|arrival] {fdate}",
            "eta::Amended ETA {ship} / {ref_bb}",
            "book,avail::[Request for|Booking of] layby berth, {ship}",
            "pilot,book::{ship} – [tug and pilot|pilot and tugs] [required|needed] {fdate}",
            "cancel::Cancellation of berth booking {ref_bb}",
            "shift::Shifting {ship} from {berth} to {berth2}",
            "book,pilot::Pre-arrival notice {ship} (IMO {imo})",
            "book,avail,eta,shift::RE: berth [window|slot] for {ship}",
            "book,avail::[Urgent|URGENT]: berth [availability|needed] {fdate}",
            "extend::Extension of stay – {ship} at {berth}",
            "{ship} [arrival|call] [{fdate}|next week]",
        ],
        "open": [
            "book::[We would like to|We wish to|Kindly note we would like to] [request|book] a berth for [our vessel|the vessel|the] {ship} [arriving|due to arrive] on {fdate} [at about|around|at approximately] {time}.",
            "book::On behalf of [the owners|our principals|the charterers], {agent} [hereby requests|requests] berthing [for|of] {ship} (IMO {imo}) [at Port Velmar|in your port].",
            "book::Please [find below|see below] the pre-arrival details for {ship}, [expected|estimated] at the pilot station on {fdate}.",
            "pilot::I am writing to [ask for|request] a pilot [and two tugs|and tug assistance|] for {ship}, [inbound|sailing inbound] from {port}.",
            "eta::[Further to|Following] [our telephone call|my earlier message|your confirmation {ref_bb}], the ETA of {ship} has [changed|been revised].",
            "cancel::We [need to|must] cancel [the|our] berth booking {ref_bb} for {ship}[ as the charter has fallen through| due to a change in rotation|].",
            "avail::Could you [let us know|advise] whether {berth} [is|will be] available [from|on] {fdate} for {ship}?",
            "shift::We [request|would like] [permission|approval] to shift {ship} from {berth} to {berth2} [on|in the morning of] {fdate}.",
            "extend::[Our|The] vessel {ship} [will need|requires] an extension of her stay at {berth} [by|for] {n} [days|more days].",
            "book::[As agents for|Acting for] {ship} we [apply for|request] a berth [and pilotage|, pilot and tugs] for [her next call|the coming call] [on|around] {fdate}.",
        ],
        "detail": [
            "!cancel::LOA {loa} m, beam {beam} m, [maximum|max.|arrival] draft {draft} m, GT {gt}.",
            "!cancel::[The vessel|She] will [discharge|load] {qty} tonnes of {cargo} [and expects to sail|with departure planned] on {fdate2}.",
            "[Last port|Previous port of call]: {port}; next port: {port2}.",
            "!cancel::[Cargo operations|Operations] are expected to take [about|approximately] {hours} hours [with two gangs|with ship's cranes|using shore cranes].",
            "book,pilot,eta,avail::[Please note|Note] that the vessel has a [stern|bow] thruster [but will still need|and requests] [one tug|two tugs|two tugs|three tugs] [for berthing|on arrival].",
            "book,pilot,avail,shift::The master [requests|asks for] a [starboard|port] side alongside berthing[ if possible|].",
            "!cancel::[A crew change|Crew change] for {n} crew members is planned while [alongside|at the berth].",
            "!cancel::[Bunkers|Fresh water and bunkers] will be [supplied|delivered] by barge [while alongside|during the call].",
            "book,avail,shift::[We understand|I understand] {berth} has a [depth|maximum permitted draft] of {depth} m at [low water|chart datum]; please confirm this is sufficient.",
            "book,pilot,eta::The pilot should board at the [outer|western] pilot station [at|around] {time} [local time|LT].",
            "eta,book,pilot::[Due to weather|Owing to bad weather] at {port} the vessel is running [about|some] {hours} hours [late|behind schedule].",
            "The agent [on the ground|in Port Velmar] will be {name2} of {agent}, [mobile|tel.] {phone}.",
            "book,pilot,shift::[Mooring gang|Linesmen] [will be|are] required for [arrival and departure|both berthing and unberthing].",
            "The vessel is [a general cargo ship|a bulk carrier|a small container feeder|a ro-ro vessel|a product tanker] built in {year}.",
            "book,avail::A layby berth [would be|is] acceptable until {berth} becomes free.",
            "book,eta,pilot::We [estimate|expect] [arrival|all fast] at {berth} [around|by] {time} on {fdate}.",
            "eta::Please [note the new|update the] ETA to {fdate} {time} [in your planning|in the berth schedule].",
            "!cancel::[Shore power|Shore-side electricity] connection is [requested|not required] during the stay.",
            "!cancel::The vessel will [use|need] the [ro-ro ramp|mobile harbour crane|grain hopper] at {berth}.",
            "!cancel::[Her|The] air draft is [about|] {airdraft} m[, so the bridge clearance is not an issue|].",
            "!cancel::[All ISPS documents have|The ISPS pre-arrival information has] been [sent|submitted] [through the port system|separately].",
            "cancel::The vessel has been [sold|redelivered to her owners|diverted to {port2}][ and will not call at Port Velmar|].",
            "cancel::[We apologise for|Sorry for] the short notice[; the cargo was not ready in time|].",
            "cancel::[A new booking|A new berth request] will follow once the [revised schedule|new rotation] is known.",
        ],
        "ask": [
            "!cancel::Kindly confirm the berth [allocation|and pilot booking] [at your earliest convenience|as soon as possible].",
            "!cancel::Please [confirm|let us know] the [berthing window|berth and time] so we can [inform the master|advise the terminal].",
            "book,pilot,eta::[We would be grateful|I would appreciate it] if you could [confirm|book] the pilot [for|at] {time}.",
            "cancel::Please [acknowledge|confirm] the cancellation and [release the berth|the release of the slot].",
            "eta,shift,extend::Could you [send|issue] [an updated|a new] berth confirmation [under|with reference] {ref_bb}?",
            "book,pilot,avail::Let us know [if|whether] any further documents are required for the berth application.",
            "book,avail,shift::Kindly advise [the next available|an alternative] berth if {berth} is [occupied|not available].",
            "cancel::Please [confirm|let us know] [whether|if] a cancellation fee [applies|will be charged].",
        ],
        "mention": [
            "[Our vessel|The vessel] {ship} [was|had been] alongside {berth} [at the time|that week].",
            "[This relates to|This concerns] the call of {ship} at {berth} [on|from] {date}.",
            "The [pilot|pilot boat] [boarded|was booked] at {time} [as planned|that morning].",
            "[The|Our] berth booking [was|had the reference] {ref_bb}.",
            "[A large ship|A cargo ship] was [berthing|being moved by tugs] at {berth} [at the time|just then].",
        ],
        "reply": [
            "Thank you for your berth application. {berth} is provisionally allocated to {ship} from {fdate} {time}. Pilot boarding will be confirmed 24 hours before arrival.",
            "Please resend the pre-arrival information for {ship}; the draft and LOA were missing from your message.",
            "Your booking {ref_bb} is confirmed. Please notify any change of ETA of more than two hours to the Harbour Master's office.",
        ],
    },
    "cargo-customs": {
        "subject": [
            "manifest::Manifest [correction|amendment] – {ship} voy. {voy}",
            "hold::Customs hold on container {container}",
            "dg::Dangerous goods declaration {un}",
            "release,hold::[Release of|Request to release] cargo, B/L {bl}",
            "dg::[IMDG|DG] notification for {ship} arriving {fdate}",
            "exam::[Inspection|Examination] appointment for {container}",
            "entry::Import [entry|declaration] query – ref {ref_cc}",
            "release,entry::Transit cargo [for|to] {port2} – documents",
            "manifest::[Missing|Short-landed] [packages|pallets] ex {ship}",
            "hold,exam::Reefer container [at|in] the [customs|inspection] area",
            "release,entry::Bonded warehouse [storage|entry] – {cargo}",
            "hold::[Container|Unit] {container} [still|] [held|on hold]",
        ],
        "open": [
            "manifest::Please find [attached|enclosed] the [corrected|amended] cargo manifest for {ship}, voyage {voy}.",
            "hold::Our container {container} [has been|was] placed on customs hold [since|on] {date} [and we have not been told why|without any explanation].",
            "dg::[We hereby declare|This is to declare] the following dangerous goods [to be discharged|to be loaded] at Port Velmar: {un}.",
            "release::I [am writing|write] [regarding|about] the [release|clearance] of [our|the] consignment [under|on] bill of lading {bl}.",
            "exam::[We|Our client] [were|was] [informed|told] that {container} has been selected for [physical|X-ray] examination.",
            "entry::[The|Our] import declaration {ref_cc} [was|has been] rejected [because of a wrong commodity code|by customs] and [we need your help|we ask for your help] [to correct it|].",
            "manifest::[We have|Our consignee has] [discovered|found] a discrepancy between the manifest and the [cargo|packages] [actually|] discharged from {ship}.",
            "dg::[As customs brokers for|On behalf of] {agent} we [submit|send] the dangerous goods [declaration|notification] for {ship}, [ETA|arriving] {fdate}.",
        ],
        "detail": [
            "The [consignment|shipment] [consists of|contains] {npkg} [packages|pallets|cartons] of {cargo}, gross weight {kg} kg.",
            "manifest::[Line|Item] {n} of the manifest shows the wrong [consignee|weight|number of packages]; [the correct figure is|it should read] {npkg}.",
            "entry,release,hold::The commodity code [declared|used] was {hs}; [the correct one is|it should have been] {hs2}.",
            "[The goods are|The cargo is] [packed in|stuffed in] {container}, seal number {seal}.",
            "dg,exam,hold::[The|A] [safety data sheet|dangerous goods certificate|container packing certificate] [is attached|is enclosed|will follow by separate mail].",
            "!dg::[Our|The] consignee [is waiting for|urgently needs] the goods for [production|a customer delivery] on {fdate}.",
            "hold,exam,release,entry::[Demurrage|Storage charges] [are already accruing|started running] [on the container|at the terminal] from {date}.",
            "hold,release,entry,exam::[The|All] import duties and VAT [were|have been] paid [on|under entry] {ref_cc}.",
            "exam,hold::[We can|The haulier can] [present the container|bring the unit] for inspection [at|in] the examination shed [on|from] {fdate}.",
            "hold,exam::The reefer is set to {temp} °C and [must remain|needs to stay] plugged in [during the hold|while it is held].",
            "manifest::{npkg} [cartons|packages] [were|appear to have been] short-landed and may still be on board {ship}.",
            "release,entry,hold::The cargo [is in transit|is transit cargo] to {port2} and [should not|will not] [be cleared for import|enter free circulation] here.",
            "release,entry,hold::[We request|We would like] [storage|entry] [in|into] the bonded warehouse until the [duty|customs] position is settled.",
            "release,entry::The [export|transit] [accompanying document|declaration] number is {mrn}.",
            "dg::The shipper [has confirmed|states] that the [packages|drums] are [correctly|properly] labelled [and placarded|with class labels].",
            "entry,release,hold::[We attach|Attached are] the commercial invoice, packing list and [certificate of origin|phytosanitary certificate].",
            "dg::Segregation [from|away from] [foodstuffs|class 5.1 cargo] [has been|was] arranged [on board|in the stowage plan].",
            "!dg::[The|Our] [customs|entry] reference is {ref_cc}[ and the MRN is {mrn}|].",
            "hold,exam,manifest::[The seal|Seal {seal}] [was found|appeared] [broken|tampered with] when the container [was discharged|came off the ship].",
        ],
        "ask": [
            "manifest::Please [confirm receipt of|acknowledge] the amended manifest and [update your records|let us know if anything is missing].",
            "dg,entry::Please [confirm receipt of|acknowledge] the declaration and [let us know if anything is missing|confirm it has been accepted].",
            "hold,exam,release::[We ask you to|Could you please] [lift the hold|release the container] [as soon as possible|without further delay].",
            "hold,release,entry::Kindly advise [what documents are needed|what else customs requires] [to release|for the release of] the goods.",
            "exam::Please [tell us|let us know] [the date and time|when] the examination [will take place|can be booked].",
            "dg,manifest,entry::Could you [forward|pass] this [declaration|notification] to the [duty officer|customs liaison office]?",
        ],
        "mention": [
            "[The|Our] cargo of {cargo} [was|had been] discharged [the day before|earlier that week].",
            "[This|It] [related to|concerned] container {container}[ which was under customs hold|].",
            "[The|Our] [manifest|customs entry] reference [is|was] {ref_cc}.",
            "[The|A] [lorry|truck] [was|had been] [collecting|loading] containers [nearby|at the terminal] [at the time|then].",
        ],
        "reply": [
            "Customs liaison has received your message. The hold on {container} is at the request of the customs service; please contact them quoting entry {ref_cc}.",
            "We confirm receipt of the dangerous goods declaration for {ship}. Please make sure the class labels are visible on arrival.",
            "The amended manifest has been forwarded to the customs service. Releases are normally made within 48 hours.",
        ],
    },
    "billing": {
        "subject": [
            "dispute,gt,days,double::[Query on|Question about] invoice {ref_inv}",
            "dispute,gt,days::Harbour dues [dispute|disputed] – {ship}",
            "refund::Refund [request|claim] [for|–] [cancelled booking|overpayment] {ref_bb}",
            "remit::[Payment|Remittance] advice – invoice {ref_inv}",
            "gt,dispute::[Wrong|Incorrect] [GT|tonnage] [on|used in] invoice {ref_inv}",
            "reminder::Reminder [received|letter] [for|about] {ref_inv} – already paid",
            "dispute,gt,days,double,refund::[Request for|Please issue a] credit note",
            "change::Change of [billing address|VAT number|bank details]",
            "change::Direct debit [mandate|set-up]",
            "double::[Duplicate|Double] invoice {ref_inv}",
            "remit,reminder,double::Statement of account [request|needed]",
            "dispute,gt,days,double,reminder,remit::[Your invoice|Invoice] {ref_inv} [dated|of] {date}",
        ],
        "open": [
            "dispute::We [have received|received] invoice {ref_inv} dated {date} for {amount} [and believe it is incorrect|which we dispute|which we cannot reconcile].",
            "gt::[I am writing to|I write to] [dispute|query] the harbour dues charged for {ship} [on|in] invoice {ref_inv}.",
            "refund::[Please|Kindly] [refund|return] the [deposit|advance payment] of {amount} [for|paid for] [booking|the cancelled booking] {ref_bb}.",
            "remit::[Please find|Attached is] [our|the] remittance advice for [payment of|] {amount} [against|covering] invoice {ref_inv}.",
            "reminder::[We have received|Today we received] a [payment reminder|second reminder|final demand] for invoice {ref_inv}, [which was paid|although we paid it] on {date}.",
            "double::[Our|The] [accounts department|finance team] [has noticed|noticed] that invoice {ref_inv} [was issued twice|appears twice on our statement].",
            "change::[With effect from|From] {fdate} [our|the] [billing address|VAT number|bank details] [will change|changes] [as follows|as shown below].",
            "days::[I have been|We have been] charged {amount} [for|by invoice {ref_inv} for] [a call|the call of {ship}] [that|which] [never took place|was cancelled in good time].",
        ],
        "detail": [
            "gt,dispute::The invoice [is based on|uses] a gross tonnage of {gt2}, whereas [the vessel's tonnage certificate shows|her certificate states] {gt}.",
            "days,dispute::[We were charged|The invoice charges] for {n} days alongside {berth}, but the vessel [sailed|left] on {date}.",
            "refund,days::Booking {ref_bb} was cancelled {n} days in advance, so under your tariff no cancellation fee should apply.",
            "remit,reminder,double::The amount [of|] {amount} was [transferred|paid] [by bank transfer|by SWIFT transfer] on {date}[, our payment reference {payref}|].",
            "dispute,double,gt::[The line for|The charge for] pilotage [appears|is included] twice on [the|this] invoice.",
            "gt,dispute::[The|Your] [tariff|schedule of harbour dues] for 2026 [gives|sets] a rate of {rate} per GT, [not|rather than] {rate2}.",
            "dispute,days::[Please note|Note] that the [cargo dues|wharfage] [are|should be] payable by the [receiver|consignee], not by [the owners|us].",
            "[Our|The] [purchase order|PO] number {po} [must appear|needs to be quoted] on every invoice [or our system rejects it|for payment to be processed].",
            "change::[The|Our] new VAT number is {vat}[ and the company name is unchanged|].",
            "refund,double,dispute::[The refund|Any refund] [should be paid|can be sent] to [IBAN|account] {iban}.",
            "dispute,gt,days::[We|I] [calculate|make] the correct total [to be|as] {amount2}[, a difference of {amount3}|].",
            "reminder,remit::The [late payment|interest] charge of {amount3} [is not|should not be] [justified|applicable] [as we paid on time|since payment was made within 30 days].",
            "!change::[A copy of the|The] [bank confirmation|payment confirmation|tonnage certificate] [is attached|is enclosed] for your [records|reference].",
            "[Our|The] customer number [with you|at the Harbour Authority] is {custno}.",
            "change,remit::[We would like to|We wish to] pay [future invoices|harbour dues] by direct debit [from|starting] {fmonth}.",
            "dispute,days,gt::[The|This] invoice [should have been|must be] addressed to {agent}, [not to us|who act as agents for the owners].",
            "dispute,gt::[The|A] [discount|rebate] for [regular callers|frequent calls] [was not applied|is missing], [although|even though] we called {n} times this year.",
        ],
        "ask": [
            "dispute,gt,days,double::Please [issue|send] a [credit note|corrected invoice] [for the difference|at your earliest convenience].",
            "reminder,remit::[Kindly|Please] [confirm|check] [your records|the payment] and [cancel|withdraw] the reminder.",
            "dispute,gt,days::[We would appreciate|I would be grateful for] a [breakdown|detailed breakdown] of the charges [on|in] {ref_inv}.",
            "remit,reminder,double,change::Please [send|provide] [an up-to-date|a current] statement of account [for|covering] {month}.",
            "refund::Please [process|arrange] the refund [within|in] 14 days[ as promised|].",
            "change,remit::[Kindly|Please] update [your|the] [customer records|ledger] accordingly.",
        ],
        "mention": [
            "[We|I] [have paid|paid] [the|all] [harbour dues|fees] [for|on] [that call|invoice {ref_inv}] [in full|already].",
            "[The|An] invoice [for this|relating to this] [is|was] [still open|disputed separately] ({ref_inv}).",
            "[The|Our] [fees|charges] of {amount} [were|have been] paid [on|by] {date}.",
            "[I|We] [pay|paid] {amount} [a year|per season] [for|in] [fees|charges] to the Authority.",
        ],
        "reply": [
            "Thank you for your query about invoice {ref_inv}. We have passed it to our finance team, who will reply within ten working days.",
            "Our records show invoice {ref_inv} as unpaid. Please send proof of payment so that we can match it.",
            "A credit note for {amount3} will be issued against {ref_inv} this week.",
        ],
    },
    "marina": {
        "subject": [
            "apply::[Seasonal|Annual] mooring application – {yacht}",
            "wait,apply::Waiting list [position|enquiry] {ref_mar}",
            "visit::Visitor berth [for|–] {yacht}, {n} nights",
            "winter::[Winter storage|Hardstanding] [for|of] {yacht}",
            "renew::[Renewal|Renew] of [yacht|mooring] permit {ref_mar}",
            "power::[Pontoon|Shore power] [electricity|supply] [on|at] {pontoon}",
            "winter::Slipway [booking|use] [on|for] {fdate}",
            "change::[Change of boat|New boat] on mooring {mooring}",
            "live::Liveaboard [request|permission]",
            "apply,renew,winter,wait::[Query|Question] about marina [fees|charges] 2027",
            "apply,visit::[Mooring|Berth] for {yacht}?",
        ],
        "open": [
            "apply::I [would like to|wish to] apply for [a seasonal|an annual|a summer] mooring [for|in the marina for] my [yacht|sailing yacht|motor cruiser] {yacht}.",
            "wait::[Could you|Can you] [tell me|let me know] where I [am|stand] on the [marina|mooring] waiting list? My reference is {ref_mar}.",
            "visit::We [are planning|plan] to visit Port Velmar [marina|] [aboard|on] {yacht} [from|arriving] {fdate} and [need|would like] a visitor berth for {n} nights.",
            "winter::I [want to|would like to] [book|arrange] [winter storage|a hardstanding space] [ashore|in the boatyard] for {yacht} from {fmonth}.",
            "renew::[My|Our] [yacht permit|mooring permit] {ref_mar} [expires|runs out] [at the end of|in] {month} and I [wish|would like] to renew it.",
            "power::[The|There is no] electricity [on|at] {pontoon} [has been off|has not worked|] [since|for] {date}.",
            "change::[We have|I have] [sold|replaced] [our|my] boat and [would like to|want to] [keep|transfer] mooring {mooring} [for|to] the new [one|yacht] {yacht}.",
            "live::[My partner and I|We] [would like to|hope to] live aboard {yacht} [in the marina|on our mooring] [over the winter|from {fmonth}].",
        ],
        "detail": [
            "!power::[She|The boat] is a {yachtlen} m [sloop|ketch|motor cruiser|catamaran] with a draft of {ydraft} m[ and a beam of {ybeam} m|].",
            "wait,apply::[I have been|We have been] on the waiting list since {wlyear}[ and have heard nothing|].",
            "renew,change,power,live,wait::[Our|My] current mooring is {mooring} on {pontoon}.",
            "apply,visit,renew,change,winter,live::[Insurance|Third-party insurance] [documents are|certificate is] attached[, valid until {fdate}|].",
            "visit,live,apply::[We|I] [will|would] need [shore power|electricity and water] [during the stay|for the whole period].",
            "winter,renew::[The|My] boat [has to be|needs to be] [lifted|craned out] [for antifouling|for a survey] [before|in] {fmonth}.",
            "visit,apply,change::[The|Our] mast is {mast} m, [so|and] we [cannot|will not be able to] [pass|get under] the [swing bridge|footbridge] [at high water|without it opening].",
            "renew,apply,winter,wait,live::[Last season|Last year] [we paid|I paid] {amount} for the mooring[; has the fee changed?|, is that still correct?]",
            "visit,live::[There are|We are] {n} [people|adults] [aboard|on board][ and a dog|].",
            "visit,apply,live::[The|Our] dinghy [will be|is] kept [on deck|on the davits][, not on the pontoon|].",
            "apply,renew,live,change::[I|We] [have read|accept] the marina [rules|regulations] [and the|including the] [liveaboard|noise] policy.",
            "power::[The|Several] [cleats|finger pontoons] on {pontoon} [are loose|are damaged], [which is dangerous|so please check them].",
            "visit::[We expect to arrive|Arrival will be] [in the afternoon|on the evening tide] [around|at] {time}.",
            "[My|Our] [club|sailing club] [is|membership is with] the {club}.",
            "!power::[The|My] [engine|outboard] [is|has been] serviced and [the boat|she] [is|has been] [antifouled|surveyed] this year.",
        ],
        "ask": [
            "apply,wait,visit,live,change,winter::Please [let me know|tell me] [whether|if] a [berth|mooring] [is|will be] available and [what it will cost|the fee].",
            "apply,renew,live,change,winter::[Could you|Please] [send|email] [me|us] the [application form|forms] [and the fee schedule|for the permit].",
            "visit,winter::[I would be grateful|I'd be grateful] [if you could|to] [confirm|reserve] the [visitor berth|space] [for|in the name of] {yacht}.",
            "wait,apply::[Please|Kindly] [confirm|let me know] [my position|the current position] on the list.",
            "power::Can [someone|the marina staff] [look at|repair] the [supply|pontoon] [soon|this week]?",
            "power::[Please|Kindly] [let me know|tell me] [whether|if] [I|we] will get a refund for the days without electricity.",
        ],
        "mention": [
            "!gt,!days,!double,!passes,!drone,!change::[I|We] [keep|moor] [a|my|our] boat ({yacht}) [on|at] {pontoon} in the marina.",
            "!passes,!badge,!gate,!dispute,!gt,!days,!double,!reminder,!remit,!refund,!change::[This happened|It happened] [near|next to] the marina [pontoons|slipway][ by {pontoon}|].",
            "!passes,!gt,!days,!double::[My|Our] [marina|mooring] reference [is|was] {ref_mar}.",
            "!passes,!badge,!gate,!dispute,!gt,!days,!double,!reminder,!remit,!refund,!change::[Yachts|Several leisure boats] [were|are] moored [close by|nearby] [in the marina|on {pontoon}].",
        ],
        "reply": [
            "Thank you for your mooring application. Your name has been added to the waiting list under reference {ref_mar}.",
            "A visitor berth on {pontoon} is reserved for {yacht}. Please call the marina office on VHF channel 80 on arrival.",
            "The marina fees for the coming season will be published on our website in {month}.",
        ],
    },
    "environment": {
        "subject": [
            "spill::Oil [sheen|slick] [near|at] {berth}",
            "noise::[Noise|Night-time noise] from [the|] [container terminal|port] [again|]",
            "dredge::Dredging [complaint|plume|silt]",
            "dust::Dust from [grain|coal|scrap|aggregate] loading",
            "fish::[Dead fish|Dead birds] [in|along] the [harbour|inner basin]",
            "smoke::[Exhaust|Smoke|Black smoke] from [vessel|ship] [at|on] {berth}",
            "spill,fish,dredge::[Pollution|Spill] report – {date}",
            "group,spill::[Litter|Rubbish] [in the water|at the slipway]",
            "dredge,fish,smoke,group::[Complaint|Concern]: [smell|odour] from the [harbour|port]",
            "noise,dust,group,smoke::[Noise|Dust|Pollution] complaint – {street}",
        ],
        "open": [
            "spill::[I want to|I wish to|I am writing to] report [an oil sheen|what looks like an oil spill|a film of oil] [on the water|] [near|next to|around] {berth} [this morning|yesterday evening|on {date}].",
            "noise::[Once again|For the third night running|Again] [we have been kept awake|I was woken] by [noise|banging and reversing alarms] from [the port|the container terminal|{berth}] [after midnight|between 1 and 4 am].",
            "dredge::[Since|Ever since] the dredging [started|began] [off|near] {quay} the water [has turned|is] [brown|murky|thick with silt][ and the smell is awful|].",
            "dust::[Residents|We] [on|in] {street} [are|have been] [covered in|suffering from] dust [from|blowing over from] the [grain|coal|aggregate] [loading|handling] at {berth}.",
            "fish::[I found|There are] [dozens of|several] dead fish [floating|washed up] [in|along] [the inner basin|the harbour wall|the slipway] [this morning|today].",
            "smoke::The {ship} [at|alongside] {berth} [has been|is] [running her generators|emitting black smoke] [all night|for hours|since she arrived].",
            "group::I [am|'m] [a member of|writing on behalf of] the {resgroup} [about|regarding] [pollution|the environmental impact of the port].",
        ],
        "detail": [
            "spill::The sheen [stretched|was] [about|roughly] {size} metres [long|across] [and had a rainbow colour|with a strong diesel smell].",
            "[I took|We took] [photos|photographs and a video] [which I can send|that are attached].",
            "noise::[The noise|It] [was|reached] [well over|around] {db} dB [on my phone app|at our bedroom window].",
            "dust,group::[Our windows|The cars on our street|Washing on the line] [are|were] [coated|covered] in [grey|black|yellow] dust [again|every morning].",
            "spill,fish::[Could this be|Is this] [from|caused by] [bilge water|ballast water|a bunkering operation] [being pumped out|]?",
            "spill,fish::[Swans|Gulls|Cormorants] [near|around] the [marina|slipway] [were covered in oil|had oil on their feathers].",
            "dredge,noise::[We understood|I understood] the [dredging|works] [licence|permit] [limits|restricts] [work|operations] to [daytime hours|07:00–19:00].",
            "dust,smoke,group::[Our|My] children [have|suffer from] asthma and the [fumes|dust] [make it worse|are making it worse].",
            "smoke,noise::[Is|Was] the [vessel|ship] [connected to|using] shore power[, as the port promised|]?",
            "dredge,fish::[Sediment|Silt] [from|released by] the [dredger|works] [is|was] [drifting|spreading] [towards|onto] the [bathing beach|oyster beds|mudflats].",
            "[I called|We rang] the [harbour office|port] [on|at] {time} but [nobody answered|no one came].",
            "spill,fish,dredge,group::[The smell|It] [was|is] [like|of] [rotten eggs|diesel|sewage] and [lasted|went on for] [hours|most of the day].",
            "group,fish::[There was|I saw] [plastic|polystyrene] and [rope|packaging] [floating|drifting] [between the pontoons|by the slipway].",
            "noise,dust,smoke,group::[This|It] has been [happening|going on] [every night|most nights|every week] [since {month}|for the past month|for weeks].",
            "[I|We] [support|appreciate] the port [and its jobs|as an employer] but [this|the pollution] [is not acceptable|has to stop].",
            "spill,dredge,fish::[The|A] [seal|family of seals|heron] [that lives|that feeds] [by|near] the [breakwater|mudflats] [has not been seen|has disappeared] since the [works|spill].",
        ],
        "ask": [
            "Please [investigate|look into this] and [tell me|let me know] what [action will be taken|you will do].",
            "[Could you|Please] [send|share] the [water quality|noise monitoring|air quality] [results|data] [for|from] [that week|{month}].",
            "noise,dust,smoke,group::[I|We] [ask|request] that [night-time|overnight] [operations|work] be [limited|stopped] [until|pending] [a proper assessment|an investigation].",
            "[Please|Kindly] [confirm|acknowledge] [receipt of this report|this complaint] [and give me|with] a reference number.",
            "[Who|Which officer] [is responsible|is in charge] for [pollution response|environmental complaints] [at the port|]?",
        ],
        "mention": [
            "[There was|I noticed] [also|] [a strong smell of diesel|oil on the water] [near|at] {berth} [at the time|that day].",
            "[The|That] [noise|dust] [from|at] {berth} [was|had been] [bad|terrible] [that night|that week].",
            "[The|A] [dredger|dredging barge] [was|had been] working [off|near] {quay} [at the time|that week].",
        ],
        "reply": [
            "Thank you for reporting this. Our environmental officer will visit the site and we will update you under reference {ref_env}.",
            "The noise readings for {month} are being reviewed. Night-time operations at {berth} are within the permitted limits.",
        ],
    },
    "security-incidents": {
        "subject": [
            "badge::Lost access badge {badge}",
            "theft::[Theft|Stolen] [outboard motor|equipment|tools] [at|on] {pontoon}",
            "trespass::Trespass[ers|] [on|at] {quay}",
            "gate::[Broken|Faulty] gate [at|–] {gate}",
            "drone::[Drone|Unauthorised drone] over {berth}",
            "vehicle,trespass::[Suspicious|Unknown] [person|vehicle] [near|at] {gate}",
            "theft,trespass,drone,vehicle,breakin::Incident report {ref_sec}",
            "passes::[Request|Application] for [temporary|contractor] access [passes|badges]",
            "breakin,trespass::Vandalism [at|on] {quay}",
            "breakin::[Attempted|] break-in [at|to] [our|the] [warehouse|container]",
        ],
        "open": [
            "badge::I [have lost|lost] my [port|access] badge [number|no.] {badge} [somewhere|] [between|near] {gate} [and|or] the [canteen|car park] [on|] {date}.",
            "theft::[Overnight|Last night|Between {date} and {date2}] [someone|thieves] [stole|took] [the|an] [outboard motor|tender and outboard|toolbox|fuel cans] from [my boat|our workboat] [on|at] {pontoon}.",
            "trespass::[Two|Three|A group of] [teenagers|people|youths] [climbed|got] over the fence [at|near] {quay} [this evening|on {date}] and were [fishing|walking] [on the quay|between the containers].",
            "gate::{gate} [has been|is] [stuck open|broken|not closing] [since|for] [{date}|two days].",
            "drone::[At|Around] {time} [today|on {date}] [a drone|an unidentified drone] [was flying|hovered] [over|above] {berth}[ while {ship} was working cargo|].",
            "vehicle::[Our|The] [night|security] [guard|watchman] [reported|noticed] [an unknown|an unmarked|a strange] [van|car] [parked|waiting] [outside|near] {gate} [for|over] [an hour|several hours].",
            "passes::[We need|Please issue] [temporary access|contractor] [badges|passes] for {n} [fitters|engineers|contractors] [working|who will work] [on|aboard] {ship} [from|on] {fdate}.",
            "breakin::[Someone|Somebody] [broke into|forced open] [our|a] [container|storage unit|warehouse door] [on|at] {quay} [during the night|over the weekend].",
        ],
        "detail": [
            "badge::[The badge|It] [is|was] [issued to|in the name of] {name} [at|of] {company}.",
            "theft,breakin,badge,trespass::[I have|We have] [reported it to|informed] the [police|Velmar police] [and|;] [the crime|their] reference is {polref}.",
            "theft::[The motor|It] [is|was] a {hp} hp [outboard|four-stroke], serial number {serial}.",
            "theft,breakin::[The|A] [padlock|chain] [was|had been] cut and the [lock box|locker] [forced|forced open].",
            "theft,breakin,trespass,vehicle,gate,drone::[CCTV|The camera] [at|on] {gate} [may have|should have] [recorded|captured] [them|it|the vehicle].",
            "vehicle,theft,breakin::[The registration|The number plate] [was|looked like] {plate}[, a white van|].",
            "trespass,breakin,theft::[The fence|A fence panel] [is|was] [damaged|bent|cut] [behind|next to] the [old fish market|warehouse|{quay}].",
            "trespass,breakin,drone,theft::[Nobody|No one] [was|got] [hurt|injured][, but it could easily have been different|].",
            "badge::[Please|Kindly] [deactivate|block|cancel] the badge [immediately|at once] [in case|so that] [it is misused|nobody else uses it].",
            "trespass,vehicle::[I|We] [challenged|spoke to] them and they [said|claimed] they [were|worked] [for|with] a [contractor|shipping agent].",
            "passes::[The|All] contractors [have|hold] [valid|current] [ID|safety cards] and [their names|a list] [are|is] attached.",
            "theft,breakin::[This is|It is] the [second|third] [theft|incident] [on|at] {pontoon} [this month|since {month}].",
            "trespass,vehicle,theft,breakin,drone,gate::[The|Our] [security|duty] officer [on shift|that night] was {name2}.",
            "gate,trespass::[The gate|It] [can be|could be] [opened|pushed open] [by hand|without a badge], [so anyone|which means anyone] can [drive|walk] in.",
            "breakin,theft::[Nothing|Nothing else] [seems|appears] to be missing[, but the door is damaged|] .",
            "passes::[Their|The] names and [ID numbers|dates of birth] [are listed below|will be sent separately].",
            "passes::[The work|The job] [will last|is expected to take] about {n} days[, mostly in daylight hours|].",
            "drone::[The drone|It] [flew|went] off towards the [marina|old town] when [we shouted|the guard approached].",
            "drone::[The crane drivers|Our crane drivers] had to stop [work|the lift] for [several minutes|a quarter of an hour].",
        ],
        "ask": [
            "badge::Please [cancel|deactivate] the [old|lost] badge and [issue|arrange] a [replacement|new one].",
            "theft,breakin,trespass,vehicle,drone::[Could you|Please] [check|review] the CCTV [for|from] [that night|{date}] and [let me know|tell me] what you find.",
            "gate,trespass::[Please|Kindly] [repair|fix] the [gate|fence] [as a matter of urgency|urgently].",
            "passes::[Please|Kindly] [confirm|let me know] [when|whether] the [passes|badges] [will be|can be] [ready|collected] [at|from] the security office.",
            "theft,breakin,badge::[I|We] [would like|need] an incident [number|reference] for [our|the] insurance [claim|company].",
        ],
        "mention": [
            "[The|Our] [gate|access] badge reader [at|on] {gate} [was|is] [not working|broken] [that day|again].",
            "[Security|The security guard] [was|had been] [informed|told] [at the time|immediately].",
            "[I|We] showed [my|our] [port|access] [badge|badges] [at|when entering through] {gate}.",
            "[A|The] [padlock|gate] [was|had been] [left open|broken] [near|at] {gate}.",
        ],
        "reply": [
            "Port Security has logged your report under {ref_sec}. Please keep any evidence and let us know if anything else is found missing.",
            "Badge {badge} has been deactivated. A replacement can be collected from the security office at {gate} between 08:00 and 16:00.",
        ],
    },
    "records-requests": {
        "subject": [
            "new::[Request for information|Records request] – {rrtopic}",
            "new::[Public Records (Access) Ordinance|Access to records] request",
            "new::[Information|Records] request: {rrtopic}",
            "new::[Copies|Copy] of {rrdoc}",
            "chase::[Follow-up|Chasing] [on|:] [my|our] [records|information] request {ref_rr}",
            "new::[Request for|Access to] documents [on|about] {rrtopic}",
            "review::[Appeal|Internal review] [of|–] [decision|refusal] {ref_rr}",
        ],
        "open": [
            "new::Under the Public Records (Access) Ordinance [I|we] [request|would like to request] [copies of|access to] {rrdoc}.",
            "new::[I am|I'm] [a journalist with {outlet}|a researcher at the University of Aramoor|a student at the University of Aramoor|a local councillor in Port Velmar] and [would like|am requesting] information about {rrtopic}.",
            "new::[Please|Kindly] [provide|send me] [the following|these] [documents|records] [held by|in the possession of] the Harbour Authority: {rrdoc}.",
            "chase::[I|We] [submitted|made] [a|my] [records|information] request [on|dated] {date} [under|with] reference {ref_rr} and [have not|have yet to] [received a reply|had an answer].",
            "review::[I|We] [ask for|request] an internal review of [the decision|your decision] [to withhold|to refuse] [the documents|information] [requested|asked for] under {ref_rr}.",
            "new::[I would like to|I wish to] [see|obtain] {rrdoc}[, under the Ordinance|, as is my right under the Ordinance|].",
        ],
        "detail": [
            "new::[I would prefer|Please provide] the [information|records] in [electronic form|PDF|spreadsheet format] [if possible|where possible].",
            "new,review::[I am|We are] [happy|willing] for personal [data|details] to be redacted.",
            "new::[If|Should] [the|this] request [is|be] too broad, [please|kindly] [tell me|advise] how [to narrow it|I could narrow it] down.",
            "new::[The|This] [information|request] [covers|relates to] the period [from|] {year} to {year2}.",
            "new,chase::[I understand|As I understand it] [the Ordinance|the law] [requires|obliges you to give] a [reply|response] within {ndays} working days.",
            "new,review::[I am|We are] not [asking for|requesting] [any|] commercially sensitive [prices|information][, only totals|].",
            "new::[Please|Kindly] [confirm|tell me] [whether|if] [a fee|any fee] [will be|is] [charged|payable] [before|prior to] [processing|you process] the request.",
            "review::[Your|The] [reply|response] [of|dated] {date} [said|stated] [the documents|the records] [were|are] [exempt|not held], [which I dispute|which I do not accept].",
            "[The|This] information [is|is clearly] in the public interest [because|as] [residents are worried about the dredging|harbour dues rose sharply this year|several thefts have been reported at the marina|the port is a public body].",
            "new::[I also|I would also like to] [request|ask for] {rrdoc2}.",
            "chase::[It is now|It has now been] [well over|more than] {ndays} working days [since my request|since I wrote].",
            "chase::[I have had|There has been] no acknowledgement[ either|, not even a reference number|].",
            "[I|We] [intend to|will] [publish|use] the [information|findings] in [an article|a report|my thesis].",
        ],
        "ask": [
            "new::[Please|Kindly] [acknowledge|confirm receipt of] this request [and give it|with] a reference number.",
            "[I look forward to|I await] your [reply|response] within the statutory [time limit|period].",
            "new,chase,review::[Please|Kindly] [send|email] the [records|documents] to [this address|the address below].",
        ],
        "mention": [
            "[I may|I will probably] [also|] [ask for|request] the [records|documents] [on this|about this] under the Ordinance.",
            "[Is there|Could you send] a [public|published] [report|record] [of|on] [this|such incidents]?",
        ],
        "reply": [
            "We acknowledge your request of {date}, reference {ref_rr}. We aim to respond within 20 working days.",
            "Some of the records you asked for are exempt from disclosure under section 12 of the Ordinance; the rest are attached.",
        ],
    },
    "careers": {
        "subject": [
            "apply::Application – {position} ({ref_hr})",
            "apply::[Job application|Applying for]: {position}",
            "spec::[Speculative|Unsolicited] application",
            "apply::CV [for|–] {position}",
            "appr::[Apprenticeship|Traineeship] [application|enquiry] 2027",
            "apply::[Question|Enquiry] about [the|your] {position} vacancy",
            "withdraw::[Withdrawal of|Withdrawing my] application {ref_hr}",
            "spec,appr::Summer [work|placement] [enquiry|request]",
        ],
        "open": [
            "apply::I [am writing to apply|would like to apply|wish to apply] for the [position|post|role] of {position} [advertised|as advertised] [on your website|in the Velmar Gazette|on the port noticeboard][ (ref. {ref_hr})|].",
            "apply::Please [find attached|accept] my [CV|CV|curriculum vitae] and [covering letter|cover letter] [for|in application for] the {position} [vacancy|position|job].",
            "spec::[I am|I'm] [interested in|keen on] [working|a career] [at|with] the Harbour Authority and [would like to know|wonder] [whether|if] [you have|there are] any [vacancies|openings] [in|for] {dept}.",
            "appr::My {child} [would like to apply|is interested in applying] for [your|the] 2027 [apprenticeship|trainee] [scheme|programme].",
            "withdraw::[I|I'd] [would like to|like to] withdraw my application [for|to] the {position} [post|role] ({ref_hr}), [as I have accepted another offer|for personal reasons].",
        ],
        "detail": [
            "apply,spec::[I have|I hold] {qual} and {n} years' experience [as|working as] {prevjob}.",
            "apply,spec::[In my current role|Currently] [at|with] {company} [I am responsible for|my work includes] {duty}.",
            "apply,spec::[I hold|I have] a valid [STCW basic safety certificate|powerboat level 2 certificate|first aid at work certificate|forklift licence|driving licence].",
            "apply,spec::[I am|I'm] [available|able] to start [at short notice|in {fmonth}|after one month's notice].",
            "apply,spec::[I am|I'm] [happy|willing] to work [shifts|nights and weekends|on call].",
            "apply,spec::[References|My references] [are available|can be provided] on request.",
            "apply,spec::[I grew up|I have lived] in Port Velmar [and know the harbour well|all my life].",
            "apply,spec::[My|The] [salary expectation|expected salary] is [around|] {salary} [per year|a year][, negotiable|].",
            "apply,spec::[I speak|I am fluent in] {langs}[, which could help with foreign crews|].",
            "apply,spec::[During|In] [my studies|my degree] [I wrote|I did] [a dissertation|a project] on {studytopic}.",
            "apply,spec::[My|The attached] CV [gives|has] [more detail|full details] of my [experience|career] [so far|to date].",
            "withdraw::[Thank you|Many thanks] for [the interview|inviting me to interview] [last week|on {date}].",
            "withdraw::[I hope|Perhaps] there will be [other|future] opportunities [later|in the future].",
            "appr::{he} [is finishing|has just finished] [school|college] [this summer|in June] and has always [wanted|hoped] to work in the port.",
            "appr::{he} [is studying|has just finished] [maths and physics|a marine engineering course|a BTEC in engineering] at Port Velmar College[ and is a keen sailor|].",
            "appr::{he} [turns|will be] {age} [in {fmonth}|this year] and is [happy|keen] to [learn on the job|start at the bottom].",
            "appr::{he} did work experience [with|at] {agent} [last summer|at school] and [enjoyed it|loved it].",
            "apply,spec::[I have|I've] [always|long] wanted [a job|a career] [on the water|in a port|with a public employer].",
            "apply,spec::[My|The enclosed] [covering letter|cover letter] explains [why I am applying|my motivation] in more detail.",
            "apply,spec::[In my jobs so far|In every job I have had] I have [worked well|been used to working] [in a team|under pressure|with the public].",
            "apply::I [meet|believe I meet] [all|most] of the [essential|key] criteria in the job description.",
            "apply,spec::[My current employer|My last appraisal] [describes me as|says I am] [reliable|careful and reliable|calm in an emergency], and [a reference|references] can confirm this.",
            "apply,spec::I am leaving my current job [because the company is relocating|to work closer to home|as my contract ends in {fmonth}], so the timing of this [vacancy|position] suits me well.",
        ],
        "ask": [
            "apply,spec::[I would welcome|I would be glad of] the opportunity to [discuss|talk about] my application [at interview|with you].",
            "apply,spec,appr::[Please|Kindly] [let me know|tell me] [whether|if] [you need|you require] any [further|more] information.",
            "apply,appr::[Could you|Please] [confirm|let me know] [the closing date|when interviews will be held]?",
            "apply,spec::Thank you for [considering|your time in reading] my application.",
            "withdraw::[Please|Kindly] [remove|delete] my [details|application] from your [records|system].",
            "appr::[Could you|Please] [tell us|let us know] when applications for the [apprenticeship|trainee] [scheme|programme] open[ and how to apply|].",
            "appr::[Is there|Will there be] an open day [for|where] [school leavers|applicants] [can visit|could visit] the port?",
        ],
        "mention": [
            "[Incidentally|By the way], my {child} [is|would be] [interested in|keen on] [a job|an apprenticeship] with the port.",
            "[I|I have] [used to work|worked] [at the port|for the Authority] [some years ago|as a seasonal worker].",
        ],
        "reply": [
            "Thank you for your interest in working at the Harbour Authority. Applications for {position} close on {fdate}.",
            "We have received your application for {position} ({ref_hr}). Shortlisted candidates will be contacted within three weeks.",
        ],
    },
}

EN_CAREER_FIELDS = {
    "qual": ["a degree in marine biology", "an HND in marine engineering",
             "a Master Mariner (Unlimited) certificate", "an accounting technician qualification",
             "a diploma in port operations", "a security industry licence",
             "an Officer of the Watch certificate", "a degree in environmental science",
             "a certificate in records management"],
    "prevjob": ["a deck officer on bulk carriers", "an accounts clerk for a freight forwarder",
                "a security guard at a distribution centre", "a marina hand at Dunmere Yacht Haven",
                "a crane driver", "a laboratory technician", "a customs clerk",
                "a ferry deckhand", "a receptionist at a shipping agency"],
    "duty": ["checking supplier invoices and chasing late payments",
             "planning berths and pilot bookings for our vessels",
             "patrolling the site and managing access control",
             "sampling water quality and writing up reports",
             "handling customs paperwork for containers",
             "looking after visiting yachts and the fuel berth",
             "answering public enquiries and filing records"],
    "langs": ["Spanish and English", "German", "Polish and English", "Portuguese", "Japanese",
              "French and a little Norwegian"],
    "studytopic": ["ballast water treatment", "port noise and local residents",
                   "the economics of small ports", "sediment transport in estuaries",
                   "access control at critical infrastructure"],
    "dept": ["the marine department", "finance", "port security", "the marina",
             "environmental services", "operations"],
}
# Records requests: (topic for a subject line, document asked for).
EN_RECORDS = [
    ("Harbour Board minutes", "the minutes of the Harbour Board meetings held in {year}"),
    ("dredging contracts", "the contract for the dredging of the inner channel"),
    ("the ro-ro ramp project", "all correspondence with {agent} about the new ro-ro ramp"),
    ("berth allocation", "the berth allocation statistics for {year}"),
    ("harbour dues increases", "the schedule of harbour dues and every change to it since {year}"),
    ("security incidents", "the number of security incidents recorded at the port each month in {year}"),
    ("water quality monitoring", "the environmental monitoring reports for the {quay} area"),
    ("the collision at {berth}", "the investigation report into the collision at {berth} on {date}"),
    ("CCTV footage", "the CCTV retention policy and the number of requests for footage"),
    ("the marina extension", "the budget and spending on the marina extension"),
    ("oil spill planning", "the oil spill contingency plan"),
    ("pilotage accidents", "the pilotage incident log for {year}"),
    ("board expenses", "the expenses claimed by Harbour Board members in {year}"),
    ("staff numbers and salaries", "the number of staff in each pay band in {year}"),
    ("noise complaints", "the log of noise complaints received since {year}"),
]

ES = {
    "berth-bookings": {
        "subject": [
            "book,eta::Solicitud de atraque – {ship}, ETA {fdate}",
            "pilot,book::[Petición|Solicitud] de práctico para el {ship}",
            "eta::Cambio de ETA del {ship} / {ref_bb}",
            "cancel::Cancelación de la reserva de atraque {ref_bb}",
            "extend::Prórroga de estancia del {ship} en el {berth}",
            "avail::¿Atraque disponible el {fdate}? – {ship}",
        ],
        "open": [
            "book::[Por la presente|Mediante este correo] solicitamos atraque para el buque {ship}, con llegada prevista el {fdate} [hacia las|sobre las] {time}.",
            "pilot::En nombre de [los armadores|nuestros principales], {agent} solicita [práctico y remolcadores|servicio de practicaje] para la entrada del {ship} procedente de {port}.",
            "eta::Les informamos de que la ETA del {ship} [ha cambiado|se ha retrasado] al {fdate} [a causa del mal tiempo|por congestión en {port}].",
            "cancel::[Lamentablemente|Por desgracia] debemos cancelar la reserva de atraque {ref_bb} del {ship}.",
            "avail::¿Podrían [indicarnos|confirmarnos] si el {berth} estará [libre|disponible] el {fdate} para el {ship}?",
            "extend::Solicitamos [autorización|permiso] para [prolongar|ampliar] la estancia del {ship} en el {berth} {n} días más.",
        ],
        "detail": [
            "!cancel::Eslora {loa} m, manga {beam} m, calado máximo {draft} m, arqueo bruto {gt} GT.",
            "!cancel::El buque [descargará|cargará] {qty} toneladas de {cargo} y [tiene previsto zarpar|prevé salir] el {fdate2}.",
            "[Último puerto|Puerto anterior]: {port}; próximo puerto: {port2}.",
            "!cancel::Las operaciones de [carga|descarga] durarán [aproximadamente|unas] {hours} horas.",
            "book,pilot,avail::El capitán [solicita|pide] {ntugs} remolcadores para la maniobra de atraque.",
            "book,pilot::[Se necesitarán|Necesitaremos] amarradores [a la llegada y a la salida|para el atraque y el desatraque].",
            "!cancel::Durante la escala está previsto un relevo de {n} tripulantes.",
            "book,pilot,eta::El práctico deberá embarcar en la estación exterior [hacia las|a las] {time} hora local.",
            "El consignatario en Port Velmar será {name2}, de {agent}, teléfono {phone}.",
            "book,avail::[Un atraque de espera|Un fondeo de espera] [sería|es] aceptable hasta que quede libre el {berth}.",
            "cancel::El fletamento se ha cancelado y el buque no hará escala en Port Velmar.",
        ],
        "ask": [
            "!cancel::Les rogamos confirmen la asignación de atraque [lo antes posible|a la mayor brevedad].",
            "book,pilot,eta,avail::[Quedamos a la espera de|Agradeceríamos] su confirmación del práctico y del atraque.",
            "cancel::Por favor, [confirmen|acusen recibo de] la cancelación y liberen el atraque.",
            "eta,extend::¿Podrían enviarnos la confirmación actualizada con la referencia {ref_bb}?",
        ],
        "mention": [
            "El buque {ship} estaba atracado en el {berth} [en ese momento|esa semana].",
            "[Se trata de|Esto se refiere a] la escala del {ship} en el {berth} del {date}.",
        ],
    },
    "cargo-customs": {
        "subject": [
            "manifest::Corrección del manifiesto – {ship}, viaje {voy}",
            "hold::Retención aduanera del contenedor {container}",
            "dg::Declaración de mercancías peligrosas {un}",
            "release,hold,entry::Despacho de la mercancía, B/L {bl}",
            "exam::[Inspección|Reconocimiento físico] del contenedor {container}",
        ],
        "open": [
            "manifest::Adjuntamos el manifiesto de carga [corregido|rectificado] del {ship}, viaje {voy}.",
            "hold::Nuestro contenedor {container} [está|permanece] retenido por la aduana desde el {date} [sin que nadie nos explique el motivo|y no sabemos por qué].",
            "dg::Por la presente declaramos las siguientes mercancías peligrosas que se [descargarán|cargarán] en Port Velmar: {un}.",
            "release::Les escribo en relación con el despacho de nuestra mercancía amparada por el conocimiento de embarque {bl}.",
            "exam::Nos han comunicado que el contenedor {container} ha sido seleccionado para [inspección física|escáner].",
            "entry::La declaración de importación {ref_cc} ha sido rechazada por un error en el código arancelario.",
        ],
        "detail": [
            "La partida consta de {npkg} [bultos|palés|cajas] de {cargo}, con un peso bruto de {kg} kg.",
            "manifest::En la línea {n} del manifiesto figura un [destinatario|peso|número de bultos] incorrecto; el dato correcto es {npkg}.",
            "entry,release,hold::El código arancelario declarado fue {hs}; el correcto es {hs2}.",
            "La mercancía va en el contenedor {container}, precinto {seal}.",
            "dg,exam,hold::Adjuntamos la ficha de datos de seguridad y el certificado de mercancías peligrosas.",
            "!dg::El destinatario necesita la mercancía con urgencia para una entrega el {fdate}.",
            "hold,exam,release,entry::[Ya se están generando|Corren ya] gastos de demora y almacenaje desde el {date}.",
            "hold,release,entry,exam::Los derechos de aduana y el IVA ya se pagaron con la declaración {ref_cc}.",
            "hold,exam::El contenedor frigorífico está a {temp} °C y debe permanecer enchufado durante la retención.",
            "release,entry,hold::La mercancía está en tránsito hacia {port2} y no debe despacharse a libre práctica aquí.",
            "manifest::Faltan {npkg} [cajas|bultos] que posiblemente siguen a bordo del {ship}.",
        ],
        "ask": [
            "hold,exam,release::Les rogamos [levanten la retención|liberen el contenedor] lo antes posible.",
            "hold,release,entry::¿Podrían indicarnos qué documentos necesita la aduana para el despacho?",
            "exam::Por favor, confirmen la fecha y hora de la inspección.",
            "dg,manifest,entry::Les agradeceríamos que acusaran recibo de la declaración.",
        ],
        "mention": [
            "La carga de {cargo} se había descargado el día anterior.",
            "Se trataba del contenedor {container}, retenido por la aduana.",
        ],
    },
    "billing": {
        "subject": [
            "dispute,gt,double::Consulta sobre la factura {ref_inv}",
            "dispute,gt,days::Reclamación de tasas portuarias – {ship}",
            "refund::Solicitud de reembolso – reserva {ref_bb}",
            "double::Factura duplicada {ref_inv}",
            "change::Cambio de datos bancarios y de facturación",
            "reminder::Recordatorio de pago de la factura {ref_inv} – ya pagada",
        ],
        "open": [
            "dispute::Hemos recibido la factura {ref_inv} de fecha {date} por importe de {amount} y [consideramos que es incorrecta|no estamos de acuerdo con ella].",
            "gt::Les escribo para reclamar las tasas portuarias cobradas al {ship} en la factura {ref_inv}.",
            "refund::Les rogamos el reembolso del anticipo de {amount} correspondiente a la reserva cancelada {ref_bb}.",
            "reminder::Hemos recibido un [recordatorio de pago|segundo aviso] de la factura {ref_inv}, que ya pagamos el {date}.",
            "double::Nuestro departamento de contabilidad ha detectado que la factura {ref_inv} se ha emitido dos veces.",
            "change::A partir del {fdate} cambian nuestros datos [bancarios|de facturación], que les indicamos a continuación.",
        ],
        "detail": [
            "gt,dispute::La factura se basa en un arqueo bruto de {gt2} GT, pero el certificado del buque indica {gt} GT.",
            "dispute,gt::Se nos cobran {n} días en el {berth}, aunque el buque zarpó el {date}.",
            "refund::La reserva {ref_bb} se canceló con {n} días de antelación, por lo que según su tarifa no procede ningún recargo.",
            "reminder,double::El importe de {amount} se transfirió el {date}, con referencia de pago {payref}.",
            "dispute,double,gt::El concepto de practicaje aparece dos veces en la factura.",
            "change::Nuestro nuevo número de IVA es {vat}.",
            "refund,double::El reembolso puede abonarse en la cuenta {iban}.",
            "dispute,gt::Según nuestros cálculos, el importe correcto es {amount2}.",
            "reminder,refund,double::Adjuntamos copia del justificante bancario.",
            "Nuestro número de cliente es {custno}.",
        ],
        "ask": [
            "dispute,gt,double::Les rogamos emitan una factura rectificativa [o un abono|] por la diferencia.",
            "reminder::Por favor, comprueben sus registros y anulen el recordatorio.",
            "dispute,gt::Les agradeceríamos un desglose detallado de los cargos de la factura {ref_inv}.",
            "change::Por favor, actualicen sus datos de cliente.",
            "refund::Les rogamos que tramiten el reembolso en un plazo de 14 días.",
        ],
        "mention": [
            "Ya hemos pagado todas las tasas portuarias de esa escala (factura {ref_inv}).",
            "Los gastos de {amount} se pagaron el {date}.",
        ],
    },
    "marina": {
        "subject": [
            "apply::Solicitud de amarre de temporada – {yacht}",
            "wait,apply::Lista de espera del puerto deportivo, ref. {ref_mar}",
            "visit::Amarre de visitante para el {yacht}, {n} noches",
            "winter::Invernaje en seco del {yacht}",
            "power::Sin electricidad en el {pontoon}",
            "renew::Renovación del permiso de amarre {ref_mar}",
        ],
        "open": [
            "apply::Quisiera solicitar un amarre de temporada en el puerto deportivo para mi [velero|barco] {yacht}.",
            "wait::¿Podrían decirme en qué posición estoy en la lista de espera? Mi referencia es {ref_mar}.",
            "visit::Tenemos previsto llegar a Port Velmar a bordo del {yacht} el {fdate} y necesitamos un amarre de visitante para {n} noches.",
            "winter::Quisiera reservar una plaza de invernaje en seco para el {yacht} a partir de {fmonth}.",
            "power::[Desde el {date}|Desde hace varios días] no hay electricidad en el {pontoon}.",
            "renew::Mi permiso de amarre {ref_mar} vence en {month} y deseo renovarlo.",
        ],
        "detail": [
            "!power::El barco es un [velero|catamarán|barco a motor] de {yachtlen} m de eslora y {ydraft} m de calado.",
            "wait,apply::Estoy en la lista de espera desde {wlyear} y no he tenido noticias.",
            "renew,power,wait::Mi amarre actual es el {mooring}, en el {pontoon}.",
            "apply,visit,renew,winter::Adjunto el certificado del seguro, válido hasta el {fdate}.",
            "visit,apply::Necesitaremos toma de corriente y agua durante la estancia.",
            "renew,apply,winter,wait::La temporada pasada pagué {amount} por el amarre; ¿ha cambiado la tarifa?",
            "visit::Somos {n} personas a bordo[ y un perro|].",
            "power::Varias cornamusas del {pontoon} están sueltas, lo cual es peligroso.",
            "Soy socio del {club}.",
        ],
        "ask": [
            "apply,wait,visit,winter::Les agradecería que me indicaran si hay amarre disponible y cuál sería el precio.",
            "apply,renew,winter::¿Podrían enviarme el formulario de solicitud y las tarifas?",
            "visit,winter::Por favor, confirmen la reserva del amarre a nombre del {yacht}.",
            "power::¿Podría alguien revisar la instalación esta semana?",
        ],
        "mention": [
            "!gt,!days,!double,!passes,!change::Tengo mi barco, el {yacht}, amarrado en el {pontoon} del puerto deportivo.",
            "!passes,!badge,!gate,!dispute,!gt,!days,!double,!reminder,!refund,!change::Ocurrió junto a los pantalanes del puerto deportivo.",
        ],
    },
    "environment": {
        "subject": [
            "spill::Mancha de [aceite|hidrocarburo] junto al {berth}",
            "noise::Ruido nocturno [en la terminal de contenedores|del puerto]",
            "dredge::Queja por el dragado",
            "dust::Polvo de la carga de [cereal|carbón|áridos]",
            "fish::Peces muertos en la dársena",
            "smoke::Humo negro del buque atracado en el {berth}",
        ],
        "open": [
            "spill::Quiero [denunciar|comunicar] una mancha de [aceite|gasóleo] en el agua junto al {berth} [esta mañana|ayer por la tarde].",
            "noise::[Otra vez|Una noche más] no hemos podido dormir por el ruido de la terminal [después de medianoche|entre la una y las cuatro].",
            "dredge::Desde que empezó el dragado cerca de {quay}, el agua está [marrón|turbia] y huele muy mal.",
            "dust::Los vecinos de {street} estamos cubiertos de polvo por la carga de [cereal|carbón] en el {berth}.",
            "fish::Esta mañana he encontrado [decenas de|varios] peces muertos flotando en la dársena interior.",
            "smoke::El {ship}, atracado en el {berth}, lleva [toda la noche|horas] echando humo negro.",
        ],
        "detail": [
            "spill::La mancha medía unos {size} metros y tenía reflejos irisados y olor a gasóleo.",
            "He hecho fotos y un vídeo que puedo enviarles.",
            "noise::El ruido alcanzó unos {db} dB en nuestra ventana.",
            "dust::Los coches y las ventanas amanecen cubiertos de polvo gris.",
            "spill,fish::¿Puede deberse a un vertido de aguas de sentina o de lastre?",
            "spill,fish::Había gaviotas manchadas de aceite cerca del puerto deportivo.",
            "dust,smoke::Nuestros hijos tienen asma y el humo lo empeora.",
            "Llamé a la oficina del puerto a las {time}, pero nadie contestó.",
            "noise,dust,smoke::Esto ocurre casi todas las noches desde hace semanas.",
        ],
        "ask": [
            "Les ruego que investiguen y me informen de las medidas que van a tomar.",
            "spill,fish,dredge::¿Podrían facilitarme los datos de calidad del agua de esa semana?",
            "noise,dust,smoke::Pedimos que se limiten las operaciones nocturnas hasta que se aclare la situación.",
            "Por favor, acusen recibo de esta queja y denme un número de referencia.",
        ],
        "mention": [
            "Además, olía mucho a gasóleo junto al {berth} ese día.",
            "Había una draga trabajando cerca de {quay} esa semana.",
        ],
    },
    "security-incidents": {
        "subject": [
            "badge::Pérdida de la tarjeta de acceso {badge}",
            "theft::Robo de un motor fueraborda en el {pontoon}",
            "trespass::Intrusos en {quay}",
            "gate::La {gate} no cierra",
            "passes::Tarjetas de acceso temporales para técnicos – {ship}",
        ],
        "open": [
            "badge::He perdido mi tarjeta de acceso al puerto, número {badge}, entre la {gate} y el aparcamiento el {date}.",
            "theft::Anoche [alguien|unos ladrones] se llevó el motor fueraborda de mi barco en el {pontoon}.",
            "trespass::[Varios jóvenes|Un grupo de personas] saltaron la valla junto a {quay} el {date} y estuvieron paseando entre los contenedores.",
            "gate::La barrera de la {gate} lleva [dos días|desde el {date}] sin cerrar.",
            "passes::Necesitamos tarjetas de acceso temporales para {n} técnicos que trabajarán a bordo del {ship} a partir del {fdate}.",
        ],
        "detail": [
            "badge::La tarjeta está a nombre de {name}, de {company}.",
            "theft,badge,trespass::Lo hemos denunciado a la policía; la referencia es {polref}.",
            "theft::El motor es de {hp} CV, número de serie {serial}.",
            "theft::Cortaron el candado y forzaron la taquilla.",
            "theft,trespass,gate::La cámara de la {gate} debería haberlo grabado.",
            "trespass::Nadie resultó herido.",
            "theft::Es el segundo robo en el {pontoon} este mes.",
            "gate,trespass::Cualquiera puede entrar en coche sin tarjeta.",
            "passes::Los técnicos trabajarán a bordo durante unos {n} días.",
        ],
        "ask": [
            "badge::Les ruego que anulen la tarjeta perdida y emitan una nueva.",
            "theft,trespass::¿Podrían revisar las grabaciones de esa noche?",
            "gate::Por favor, reparen la barrera cuanto antes.",
            "theft,badge::Necesito un número de incidente para el seguro.",
            "passes::Les ruego que nos indiquen cuándo podemos recoger las tarjetas.",
        ],
        "mention": [
            "Mostré mi tarjeta de acceso al entrar por la {gate}.",
            "Se avisó enseguida al vigilante de seguridad.",
        ],
    },
    "records-requests": {
        "subject": [
            "new::Solicitud de acceso a documentos – {rrtopic}",
            "new::Solicitud de información pública",
            "chase,review::Reclamación: solicitud {ref_rr} sin respuesta",
        ],
        "open": [
            "new::Al amparo de la Ordenanza de Acceso a los Registros Públicos, solicito copia de {rrdoc}.",
            "new::Soy [periodista|investigadora|estudiante] y quisiera obtener información sobre {rrtopic}.",
            "chase::Presenté una solicitud de información el {date} con la referencia {ref_rr} y todavía no he recibido respuesta.",
            "review::Solicito la revisión de su decisión de denegar los documentos pedidos en la solicitud {ref_rr}.",
        ],
        "detail": [
            "new::Preferiría recibir la información en formato electrónico.",
            "new,review::No tengo inconveniente en que se supriman los datos personales.",
            "new::La solicitud abarca el periodo de {year} a 2026.",
            "new,chase::Entiendo que la Ordenanza obliga a responder en un plazo de {ndays} días hábiles.",
            "new::Les ruego que me indiquen si la solicitud tiene algún coste.",
            "La información es de interés público porque los vecinos están preocupados.",
        ],
        "ask": [
            "new::Les ruego acusen recibo de esta solicitud y le asignen un número de referencia.",
            "Quedo a la espera de su respuesta dentro del plazo legal.",
        ],
        "mention": [
            "Es posible que también solicite los documentos sobre este asunto.",
        ],
    },
    "careers": {
        "subject": [
            "apply::Candidatura – {position} ({ref_hr})",
            "Solicitud de empleo",
            "apply::Currículum para el puesto de {position}",
        ],
        "open": [
            "apply::Me dirijo a ustedes para presentar mi candidatura al puesto de {position} publicado en su web.",
            "apply::Adjunto mi currículum y carta de presentación para la vacante de {position}.",
            "spec::Me interesa trabajar en la Autoridad Portuaria y quisiera saber si tienen alguna vacante.",
        ],
        "detail": [
            "Tengo {n} años de experiencia en el sector portuario.",
            "Actualmente trabajo en {company}.",
            "Estoy disponible para incorporarme de inmediato.",
            "Puedo trabajar por turnos y fines de semana.",
            "Hablo español, inglés y algo de alemán.",
            "Puedo facilitar referencias si lo desean.",
        ],
        "ask": [
            "Quedo a su disposición para una entrevista.",
            "Les agradezco de antemano su atención.",
        ],
        "mention": [
            "Por cierto, a mi hijo le interesaría trabajar en el puerto.",
        ],
    },
}
ES_RECORDS = [
    ("las actas de la Junta del Puerto", "las actas de la Junta del Puerto de {year}"),
    ("los contratos de dragado", "el contrato de dragado del canal interior"),
    ("la asignación de atraques", "las estadísticas de asignación de atraques de {year}"),
    ("la calidad del agua", "los informes de vigilancia ambiental de la zona de {quay}"),
    ("los incidentes de seguridad", "el número de incidentes de seguridad registrados en {year}"),
    ("la subida de las tasas portuarias", "el cuadro de tasas portuarias y sus cambios desde {year}"),
    ("la ampliación del puerto deportivo", "el presupuesto de la ampliación del puerto deportivo"),
]

DE = {
    "berth-bookings": {
        "subject": [
            "book,eta::Liegeplatzanfrage {ship}, ETA {fdate}",
            "pilot,book::Lotsenanforderung {ship}",
            "eta::Geänderte ETA {ship} / {ref_bb}",
            "cancel::Stornierung Liegeplatzbuchung {ref_bb}",
            "shift::Verholen {ship} von {berth} nach {berth2}",
            "avail::Anfrage freier Liegeplatz am {fdate} – {ship}",
        ],
        "open": [
            "book::[Hiermit beantragen wir|Wir beantragen hiermit] einen Liegeplatz für [unser Schiff|das Schiff] {ship}, voraussichtliche Ankunft am {fdate} gegen {time} Uhr.",
            "pilot::Im Auftrag der [Reederei|Eigner] bittet {agent} um Lotsen und Schlepperhilfe für das Einlaufen der {ship} aus {port}.",
            "eta::Die ETA der {ship} hat sich [wetterbedingt|wegen Staus in {port}] auf den {fdate} verschoben.",
            "cancel::Leider müssen wir die Liegeplatzbuchung {ref_bb} für die {ship} stornieren.",
            "avail::Können Sie uns mitteilen, ob {berth} am {fdate} für die {ship} frei ist?",
            "shift::Wir bitten um Genehmigung, die {ship} am {fdate} von {berth} nach {berth2} zu verholen.",
        ],
        "detail": [
            "!cancel::Länge über alles {loa} m, Breite {beam} m, Tiefgang {draft} m, BRZ {gt}.",
            "!cancel::Das Schiff wird {qty} t {cargo} [löschen|laden] und voraussichtlich am {fdate2} auslaufen.",
            "Letzter Hafen: {port}; nächster Hafen: {port2}.",
            "!cancel::Die Ladungsarbeiten dauern [etwa|ca.] {hours} Stunden.",
            "book,pilot,avail,shift::Der Kapitän bittet um {ntugs} Schlepper für das Anlegemanöver.",
            "book,pilot,shift::Festmacher werden beim An- und Ablegen benötigt.",
            "!cancel::Während der Liegezeit ist ein Crewwechsel für {n} Besatzungsmitglieder geplant.",
            "book,pilot,eta::Der Lotse soll gegen {time} Uhr Ortszeit an der äußeren Lotsenstation an Bord kommen.",
            "Ansprechpartner vor Ort ist {name2} von {agent}, Tel. {phone}.",
            "book,avail::Ein Warteliegeplatz wäre bis zum Freiwerden von {berth} in Ordnung.",
            "cancel::Die Charter ist geplatzt, das Schiff läuft Port Velmar nicht an.",
        ],
        "ask": [
            "!cancel::Bitte bestätigen Sie uns die Liegeplatzzuteilung [so bald wie möglich|zeitnah].",
            "book,pilot,eta,avail::Wir bitten um Bestätigung von Lotse und Liegeplatz.",
            "cancel::Bitte bestätigen Sie die Stornierung und geben Sie den Liegeplatz frei.",
            "eta,shift::Könnten Sie uns eine aktualisierte Bestätigung unter {ref_bb} senden?",
        ],
        "mention": [
            "Die {ship} lag zu dem Zeitpunkt an {berth}.",
            "Es geht um den Anlauf der {ship} an {berth} am {date}.",
        ],
    },
    "cargo-customs": {
        "subject": [
            "manifest::Manifestkorrektur – {ship}, Reise {voy}",
            "hold::Zollsperre Container {container}",
            "dg::Gefahrgutanmeldung {un}",
            "release,hold,entry::Freigabe der Ware, B/L {bl}",
            "exam::Beschau Container {container}",
        ],
        "open": [
            "manifest::Anbei erhalten Sie das korrigierte Ladungsmanifest der {ship}, Reise {voy}.",
            "hold::Unser Container {container} ist seit dem {date} vom Zoll gesperrt, ohne dass uns ein Grund genannt wurde.",
            "dg::Hiermit melden wir folgende Gefahrgüter zum [Löschen|Laden] in Port Velmar an: {un}.",
            "release::Ich schreibe Ihnen wegen der Zollabfertigung unserer Sendung zum Konnossement {bl}.",
            "exam::Uns wurde mitgeteilt, dass der Container {container} für eine [Beschau|Röntgenkontrolle] ausgewählt wurde.",
            "entry::Die Einfuhranmeldung {ref_cc} wurde wegen einer falschen Zolltarifnummer abgelehnt.",
        ],
        "detail": [
            "Die Sendung besteht aus {npkg} [Packstücken|Paletten|Kartons] {cargo}, Bruttogewicht {kg} kg.",
            "manifest::In Position {n} des Manifests ist [der Empfänger|das Gewicht|die Packstückzahl] falsch angegeben; richtig ist {npkg}.",
            "entry,release,hold::Angemeldet wurde die Tarifnummer {hs}, richtig ist {hs2}.",
            "Die Ware ist im Container {container} verladen, Plombennummer {seal}.",
            "dg,exam,hold::Das Sicherheitsdatenblatt und die Gefahrguterklärung liegen bei.",
            "!dg::Der Empfänger benötigt die Ware dringend für eine Lieferung am {fdate}.",
            "hold,exam,release,entry::Seit dem {date} fallen bereits Lager- und Standgelder an.",
            "hold,release,entry,exam::Zoll und Einfuhrumsatzsteuer wurden unter {ref_cc} bereits bezahlt.",
            "hold,exam::Der Kühlcontainer ist auf {temp} °C eingestellt und muss während der Sperre am Strom bleiben.",
            "release,entry,hold::Die Ware ist Transitgut nach {port2} und soll hier nicht in den freien Verkehr gelangen.",
        ],
        "ask": [
            "hold,exam,release::Wir bitten Sie, die Sperre [umgehend|so schnell wie möglich] aufzuheben.",
            "hold,release,entry::Bitte teilen Sie uns mit, welche Unterlagen der Zoll für die Freigabe benötigt.",
            "exam::Bitte nennen Sie uns Datum und Uhrzeit der Beschau.",
            "dg,manifest,entry::Bitte bestätigen Sie den Eingang der Anmeldung.",
        ],
        "mention": [
            "Die Ladung {cargo} war am Vortag gelöscht worden.",
            "Es handelte sich um den Container {container}, der unter Zollsperre stand.",
        ],
    },
    "billing": {
        "subject": [
            "dispute,gt,double::Rückfrage zur Rechnung {ref_inv}",
            "dispute,gt::Einspruch gegen Hafengebühren – {ship}",
            "refund::Erstattung Anzahlung Buchung {ref_bb}",
            "double::Doppelte Rechnung {ref_inv}",
            "change::Neue Bankverbindung / Rechnungsanschrift",
            "reminder::Mahnung zur Rechnung {ref_inv} – bereits bezahlt",
        ],
        "open": [
            "dispute::Wir haben Ihre Rechnung {ref_inv} vom {date} über {amount} erhalten und halten sie für fehlerhaft.",
            "gt::Hiermit widersprechen wir den Hafengebühren für die {ship} laut Rechnung {ref_inv}.",
            "refund::Bitte erstatten Sie uns die Anzahlung von {amount} für die stornierte Buchung {ref_bb}.",
            "reminder::Wir haben eine Zahlungserinnerung zur Rechnung {ref_inv} erhalten, obwohl wir am {date} bezahlt haben.",
            "double::Unserer Buchhaltung ist aufgefallen, dass die Rechnung {ref_inv} doppelt gestellt wurde.",
            "change::Ab dem {fdate} ändern sich unsere [Bankverbindung|Rechnungsanschrift|USt-IdNr.] wie folgt.",
        ],
        "detail": [
            "gt,dispute::Der Rechnung liegt eine BRZ von {gt2} zugrunde, laut Messbrief hat das Schiff jedoch {gt}.",
            "dispute,gt::Berechnet wurden {n} Liegetage an {berth}, das Schiff ist aber bereits am {date} ausgelaufen.",
            "refund::Die Buchung {ref_bb} wurde {n} Tage im Voraus storniert; laut Tarif fällt daher keine Gebühr an.",
            "reminder,double::Der Betrag von {amount} wurde am {date} überwiesen, Verwendungszweck {payref}.",
            "dispute,double,gt::Die Lotsgebühr ist auf der Rechnung zweimal aufgeführt.",
            "change::Unsere neue USt-IdNr. lautet {vat}.",
            "refund,double::Die Erstattung bitte auf das Konto {iban} überweisen.",
            "dispute,gt::Nach unserer Berechnung beträgt der richtige Betrag {amount2}.",
            "reminder,refund,double::Eine Kopie des Überweisungsbelegs liegt bei.",
            "Unsere Kundennummer lautet {custno}.",
        ],
        "ask": [
            "dispute,gt,double::Bitte senden Sie uns eine Gutschrift bzw. eine korrigierte Rechnung.",
            "reminder::Bitte prüfen Sie den Zahlungseingang und stornieren Sie die Mahnung.",
            "dispute,gt::Wir bitten um eine detaillierte Aufstellung der Positionen auf {ref_inv}.",
            "change::Bitte aktualisieren Sie Ihre Stammdaten entsprechend.",
            "refund::Bitte überweisen Sie den Betrag innerhalb von 14 Tagen.",
        ],
        "mention": [
            "Die Hafengebühren für diesen Anlauf haben wir bereits bezahlt (Rechnung {ref_inv}).",
            "Die Gebühren von {amount} wurden am {date} beglichen.",
        ],
    },
    "marina": {
        "subject": [
            "apply::Antrag auf Saisonliegeplatz – {yacht}",
            "wait,apply::Warteliste Yachthafen, Az. {ref_mar}",
            "visit::Gastliegeplatz für die {yacht}, {n} Nächte",
            "winter::Winterlager an Land für die {yacht}",
            "power::Kein Strom am {pontoon}",
            "renew::Verlängerung Liegeplatzgenehmigung {ref_mar}",
        ],
        "open": [
            "apply::Ich möchte einen Saisonliegeplatz im Yachthafen für meine [Segelyacht|Motoryacht] {yacht} beantragen.",
            "wait::Können Sie mir sagen, auf welchem Platz der Warteliste ich stehe? Mein Aktenzeichen ist {ref_mar}.",
            "visit::Wir möchten am {fdate} mit der {yacht} nach Port Velmar kommen und benötigen einen Gastliegeplatz für {n} Nächte.",
            "winter::Ich möchte für die {yacht} ab {fmonth} einen Winterlagerplatz an Land buchen.",
            "power::Seit dem {date} gibt es am {pontoon} keinen Strom mehr.",
            "renew::Meine Liegeplatzgenehmigung {ref_mar} läuft im {month} aus, und ich möchte sie verlängern.",
        ],
        "detail": [
            "!power::Das Boot ist eine {yachtlen} m lange [Slup|Ketsch|Motoryacht] mit {ydraft} m Tiefgang.",
            "wait,apply::Ich stehe seit {wlyear} auf der Warteliste und habe nichts mehr gehört.",
            "renew,power,wait::Mein jetziger Liegeplatz ist {mooring} am {pontoon}.",
            "apply,visit,renew,winter::Die Versicherungsbestätigung liegt bei, gültig bis {fdate}.",
            "visit,apply::Wir benötigen während des Aufenthalts Landstrom und Wasser.",
            "renew,apply,winter,wait::Letzte Saison habe ich {amount} für den Liegeplatz bezahlt; gilt der Preis noch?",
            "visit::Wir sind {n} Personen an Bord[ und ein Hund|].",
            "power::Mehrere Klampen am {pontoon} sind lose, das ist gefährlich.",
            "Ich bin Mitglied im {club}.",
        ],
        "ask": [
            "apply,wait,visit,winter::Bitte teilen Sie mir mit, ob ein Liegeplatz frei ist und was er kostet.",
            "apply,renew,winter::Könnten Sie mir das Antragsformular und die Preisliste schicken?",
            "visit,winter::Bitte reservieren Sie den Gastliegeplatz auf den Namen {yacht}.",
            "power::Kann sich bitte jemand diese Woche darum kümmern?",
        ],
        "mention": [
            "!gt,!days,!double,!passes,!change::Mein Boot, die {yacht}, liegt am {pontoon} im Yachthafen.",
            "!passes,!badge,!gate,!dispute,!gt,!days,!double,!reminder,!refund,!change::Es passierte direkt neben den Stegen des Yachthafens.",
        ],
    },
    "environment": {
        "subject": [
            "spill::Ölfilm an {berth}",
            "noise::Nächtlicher Lärm vom Containerterminal",
            "dredge::Beschwerde wegen Baggerarbeiten",
            "dust::Staub von der [Getreide|Kohle]verladung",
            "fish::Tote Fische im Hafenbecken",
            "smoke::Schwarzer Rauch von der {ship}",
        ],
        "open": [
            "spill::Ich möchte einen Ölfilm auf dem Wasser an {berth} melden, den ich [heute Morgen|gestern Abend] bemerkt habe.",
            "noise::[Schon wieder|Die dritte Nacht in Folge] wurden wir nach Mitternacht vom Lärm des Containerterminals geweckt.",
            "dredge::Seit Beginn der Baggerarbeiten bei {quay} ist das Wasser [braun|trüb] und es stinkt.",
            "dust::Wir Anwohner in der {street} sind ständig mit Staub von der Verladung an {berth} bedeckt.",
            "fish::Heute Morgen trieben [Dutzende|mehrere] tote Fische im inneren Hafenbecken.",
            "smoke::Die {ship} an {berth} stößt seit Stunden schwarzen Rauch aus.",
        ],
        "detail": [
            "spill::Der Ölfilm war etwa {size} Meter lang, schillerte bunt und roch nach Diesel.",
            "Ich habe Fotos und ein Video gemacht, die ich Ihnen schicken kann.",
            "noise::Der Lärm lag an unserem Schlafzimmerfenster bei etwa {db} dB.",
            "dust::Autos und Fensterbänke sind jeden Morgen mit grauem Staub bedeckt.",
            "spill,fish::Könnte das von abgepumptem Bilgen- oder Ballastwasser kommen?",
            "spill,fish::Am Yachthafen habe ich verölte Möwen gesehen.",
            "dust,smoke::Unsere Kinder haben Asthma, und die Abgase machen es schlimmer.",
            "Ich habe um {time} Uhr beim Hafenamt angerufen, aber niemand ging ran.",
            "noise,dust,smoke::Das geht seit Wochen fast jede Nacht so.",
        ],
        "ask": [
            "Bitte gehen Sie der Sache nach und teilen Sie mir mit, was unternommen wird.",
            "spill,fish,dredge::Könnten Sie mir die Wasserqualitätsdaten dieser Woche zukommen lassen?",
            "noise,dust,smoke::Wir fordern, den Nachtbetrieb bis zur Klärung einzuschränken.",
            "Bitte bestätigen Sie den Eingang dieser Beschwerde mit einem Aktenzeichen.",
        ],
        "mention": [
            "Außerdem roch es an dem Tag an {berth} stark nach Diesel.",
            "In der Woche arbeitete ein Bagger vor {quay}.",
        ],
    },
    "security-incidents": {
        "subject": [
            "badge::Verlust Hafenausweis {badge}",
            "theft::Diebstahl Außenbordmotor am {pontoon}",
            "trespass::Unbefugte Personen auf {quay}",
            "gate::{gate} schließt nicht",
            "passes::Befristete Zugangsausweise für Monteure – {ship}",
        ],
        "open": [
            "badge::Ich habe am {date} meinen Hafenausweis Nr. {badge} zwischen {gate} und dem Parkplatz verloren.",
            "theft::Letzte Nacht wurde der Außenbordmotor meines Bootes am {pontoon} gestohlen.",
            "trespass::Am {date} sind mehrere Jugendliche bei {quay} über den Zaun geklettert und zwischen den Containern herumgelaufen.",
            "gate::Die Schranke an {gate} schließt seit [zwei Tagen|dem {date}] nicht mehr.",
            "passes::Wir benötigen ab dem {fdate} befristete Zugangsausweise für {n} Monteure, die an Bord der {ship} arbeiten.",
        ],
        "detail": [
            "badge::Der Ausweis ist auf {name} von {company} ausgestellt.",
            "theft,badge,trespass::Wir haben Anzeige bei der Polizei erstattet, Aktenzeichen {polref}.",
            "theft::Der Motor hat {hp} PS, Seriennummer {serial}.",
            "theft::Das Vorhängeschloss wurde aufgeschnitten und der Spind aufgebrochen.",
            "theft,trespass,gate::Die Kamera an {gate} müsste es aufgezeichnet haben.",
            "trespass::Verletzt wurde niemand.",
            "theft::Das ist schon der zweite Diebstahl am {pontoon} in diesem Monat.",
            "gate,trespass::Jeder kann ohne Ausweis hineinfahren.",
            "passes::Die Arbeiten an Bord dauern etwa {n} Tage.",
        ],
        "ask": [
            "badge::Bitte sperren Sie den verlorenen Ausweis und stellen Sie einen neuen aus.",
            "theft,trespass::Könnten Sie die Videoaufnahmen der Nacht prüfen?",
            "gate::Bitte reparieren Sie die Schranke umgehend.",
            "theft,badge::Ich benötige für die Versicherung eine Vorgangsnummer.",
            "passes::Bitte teilen Sie uns mit, wann die Ausweise abgeholt werden können.",
        ],
        "mention": [
            "Ich habe meinen Hafenausweis an {gate} vorgezeigt.",
            "Der Wachdienst wurde sofort informiert.",
        ],
    },
    "records-requests": {
        "subject": [
            "new::Antrag auf Akteneinsicht – {rrtopic}",
            "new::Auskunftsersuchen nach der Verordnung über den Zugang zu öffentlichen Unterlagen",
            "chase,review::Erinnerung: Antrag {ref_rr} unbeantwortet",
        ],
        "open": [
            "new::Auf Grundlage der Verordnung über den Zugang zu öffentlichen Unterlagen beantrage ich Einsicht in {rrdoc}.",
            "new::Ich bin [Journalistin|Wissenschaftler|Student] und bitte um Auskunft zum Thema {rrtopic}.",
            "chase::Ich habe am {date} einen Antrag unter dem Aktenzeichen {ref_rr} gestellt und noch keine Antwort erhalten.",
            "review::Ich lege Widerspruch gegen Ihre Entscheidung ein, die unter {ref_rr} beantragten Unterlagen nicht herauszugeben.",
        ],
        "detail": [
            "new::Ich bitte um Übermittlung in elektronischer Form.",
            "new,review::Personenbezogene Daten können gern geschwärzt werden.",
            "new::Der Antrag betrifft den Zeitraum {year} bis 2026.",
            "new,chase::Nach meinem Verständnis ist eine Antwort innerhalb von {ndays} Arbeitstagen vorgeschrieben.",
            "new::Bitte teilen Sie mir vorab mit, ob Gebühren anfallen.",
            "Die Informationen sind von öffentlichem Interesse, da sich die Anwohner Sorgen machen.",
        ],
        "ask": [
            "new::Bitte bestätigen Sie den Eingang dieses Antrags mit einem Aktenzeichen.",
            "Ich erwarte Ihre Antwort innerhalb der gesetzlichen Frist.",
        ],
        "mention": [
            "Gegebenenfalls werde ich die Unterlagen dazu auch förmlich anfordern.",
        ],
    },
    "careers": {
        "subject": [
            "apply::Bewerbung als {position} ({ref_hr})",
            "spec::Initiativbewerbung",
            "apply::Bewerbungsunterlagen – {position}",
        ],
        "open": [
            "apply::Hiermit bewerbe ich mich auf die ausgeschriebene Stelle als {position}.",
            "apply::Anbei sende ich Ihnen meinen Lebenslauf und mein Anschreiben für die Stelle als {position}.",
            "spec::Ich interessiere mich für eine Tätigkeit bei der Hafenbehörde und möchte fragen, ob Sie offene Stellen haben.",
        ],
        "detail": [
            "Ich habe {n} Jahre Berufserfahrung in der Hafenwirtschaft.",
            "Derzeit bin ich bei {company} beschäftigt.",
            "Ich kann kurzfristig anfangen.",
            "Schichtarbeit und Wochenenddienste sind für mich kein Problem.",
            "Ich spreche Deutsch, Englisch und etwas Spanisch.",
            "Referenzen reiche ich gern nach.",
        ],
        "ask": [
            "Über eine Einladung zum Vorstellungsgespräch würde ich mich sehr freuen.",
            "Für Rückfragen stehe ich jederzeit zur Verfügung.",
        ],
        "mention": [
            "Übrigens würde sich mein Sohn für eine Ausbildung im Hafen interessieren.",
        ],
    },
}
DE_RECORDS = [
    ("Protokolle des Hafenrats", "die Protokolle der Sitzungen des Hafenrats aus {year}"),
    ("Baggerverträge", "den Vertrag über die Baggerarbeiten im inneren Fahrwasser"),
    ("Liegeplatzvergabe", "die Statistik der Liegeplatzvergabe für {year}"),
    ("Wasserqualität", "die Umweltmessberichte für den Bereich {quay}"),
    ("Sicherheitsvorfälle im Hafen", "die Zahl der im Jahr {year} erfassten Sicherheitsvorfälle"),
    ("Hafengebühren", "die Gebührenordnung und ihre Änderungen seit {year}"),
    ("Erweiterung des Yachthafens", "die Kosten der Erweiterung des Yachthafens"),
]

JA = {
    "berth-bookings": {
        "subject": [
            "book,eta::「{ship}」入港バース申請（ETA {fdate}）",
            "pilot,book::「{ship}」水先人手配のお願い",
            "eta::「{ship}」ETA変更のご連絡／{ref_bb}",
            "cancel::バース予約{ref_bb}キャンセルのお願い",
            "shift::「{ship}」{berth}から{berth2}へのシフトについて",
            "avail::{fdate}のバース空き状況について（「{ship}」）",
            "extend::「{ship}」停泊期間延長のお願い",
        ],
        "open": [
            "book::弊社[運航船|代理店扱い船]「{ship}」の入港にあたり、バースの割当てをお願いしたく、ご連絡いたしました。",
            "book,pilot::「{ship}」は{fdate}{time}頃にパイロットステーション到着予定です。",
            "eta::{port}での[荒天|滞船]のため、「{ship}」のETAが{fdate}に変更となりましたのでお知らせいたします。",
            "cancel::誠に恐縮ですが、「{ship}」のバース予約（{ref_bb}）をキャンセルさせていただきたく存じます。",
            "avail::{fdate}に{berth}が空いているかご確認いただけますでしょうか。",
            "extend::「{ship}」の{berth}での停泊期間を{n}日間延長したく、お願い申し上げます。",
        ],
        "detail": [
            "!cancel::全長{loa}m、幅{beam}m、最大喫水{draft}m、総トン数{gt}トンです。",
            "!cancel::本船は{cargo}{qty}トンを[揚げ荷|積み荷]し、{fdate2}に出港予定です。",
            "前港は{port}、次港は{port2}です。",
            "!cancel::荷役時間は約{hours}時間を見込んでおります。",
            "book,pilot,avail::船長より着岸時にタグボート{ntugs}隻の手配を希望しております。",
            "book,pilot::着岸・離岸の際には綱取り作業員が必要です。",
            "!cancel::停泊中に乗組員{n}名の交代を予定しております。",
            "book,pilot,eta::水先人の乗船は現地時間{time}頃、外側パイロットステーションでお願いいたします。",
            "現地代理店の担当は{agent}の{name2}（電話 {phone}）です。",
            "book,avail::{berth}が空くまでの間、待機バースでも差し支えございません。",
            "cancel::傭船契約が解除となり、本船はポートベルマーに寄港しないこととなりました。",
        ],
        "ask": [
            "!cancel::バースの割当てについて、至急ご確認いただけますと幸いです。",
            "book,pilot,eta,avail::水先人およびバースの手配につき、ご確認をお願いいたします。",
            "cancel::キャンセルの受付をご確認のうえ、バースを解放していただけますようお願いいたします。",
            "eta,extend::{ref_bb}にて更新後の確認書をお送りいただけますでしょうか。",
        ],
        "mention": [
            "当時、「{ship}」は{berth}に着岸しておりました。",
            "本件は{date}の「{ship}」の{berth}寄港に関するものです。",
        ],
    },
    "cargo-customs": {
        "subject": [
            "manifest::「{ship}」第{voy}次航海 積荷目録訂正の件",
            "hold::コンテナ{container}の税関保留について",
            "dg::危険物申告 {un}",
            "release,hold,entry::B/L {bl} 貨物の引取りについて",
            "exam::コンテナ{container}の検査日程について",
        ],
        "open": [
            "manifest::「{ship}」第{voy}次航海の訂正後の積荷目録（マニフェスト）を添付いたします。",
            "hold::弊社コンテナ{container}が{date}より税関保留となっておりますが、理由の説明がございません。",
            "dg::下記危険物をポートベルマー港にて[揚げ|積み]予定のため、申告いたします：{un}。",
            "release::船荷証券{bl}の貨物の通関について、ご相談させてください。",
            "exam::コンテナ{container}が[開披検査|X線検査]の対象に選ばれたとの連絡を受けました。",
            "entry::輸入申告{ref_cc}がHSコードの誤りにより差し戻されました。",
        ],
        "detail": [
            "貨物は{cargo}{npkg}個口、総重量{kg}kgです。",
            "manifest::マニフェスト{n}行目の[荷受人|重量|個数]に誤りがあり、正しくは{npkg}です。",
            "entry,release,hold::申告したHSコードは{hs}ですが、正しくは{hs2}です。",
            "貨物はコンテナ{container}（シール番号{seal}）に積載されています。",
            "dg,exam,hold::SDS（安全データシート）および危険物明細書を添付いたします。",
            "!dg::荷受人は{fdate}の納品のため、貨物を至急必要としております。",
            "hold,exam,release,entry::{date}からすでにデマレージおよび保管料が発生しております。",
            "hold,release,entry,exam::関税および消費税は申告{ref_cc}にて納付済みです。",
            "hold,exam::リーファーコンテナは{temp}℃に設定されており、保留中も電源接続が必要です。",
            "release,entry,hold::本貨物は{port2}向けの通過貨物であり、当港での輸入通関は予定しておりません。",
        ],
        "ask": [
            "hold,exam,release::保留を早急に解除していただけますようお願いいたします。",
            "hold,release,entry::貨物の引取りに必要な書類をお知らせください。",
            "exam::検査の日時をご連絡いただけますでしょうか。",
            "dg,manifest,entry::申告書の受領をご確認いただけますと幸いです。",
        ],
        "mention": [
            "{cargo}の荷揚げは前日に終わっておりました。",
            "対象は税関保留中のコンテナ{container}でした。",
        ],
    },
    "billing": {
        "subject": [
            "dispute,gt,double::請求書{ref_inv}についてのお問い合わせ",
            "dispute,gt::「{ship}」入港料の請求について（異議）",
            "refund::予約{ref_bb}キャンセルに伴う返金のお願い",
            "double::請求書{ref_inv}の二重発行について",
            "change::振込先口座・請求先変更のお知らせ",
            "reminder::請求書{ref_inv}の督促について（支払済み）",
        ],
        "open": [
            "dispute::{date}付の請求書{ref_inv}（{amount}）を受領いたしましたが、内容に誤りがあるように思われます。",
            "gt::請求書{ref_inv}に記載された「{ship}」の入港料について、異議を申し上げます。",
            "refund::キャンセルした予約{ref_bb}の前払金{amount}の返金をお願いいたします。",
            "reminder::請求書{ref_inv}の督促状が届きましたが、{date}に支払済みです。",
            "double::弊社経理部より、請求書{ref_inv}が二重に発行されているとの指摘がありました。",
            "change::{fdate}より弊社の[振込先口座|請求先住所]が下記のとおり変更となります。",
        ],
        "detail": [
            "gt,dispute::請求書では総トン数{gt2}トンで計算されていますが、本船のトン数証書では{gt}トンです。",
            "dispute,gt::{berth}での停泊{n}日分が請求されていますが、本船は{date}に出港しております。",
            "refund::予約{ref_bb}は{n}日前にキャンセルしており、料金表によればキャンセル料は発生しないはずです。",
            "reminder,double::{amount}は{date}に振込済みです（振込番号{payref}）。",
            "dispute,double,gt::水先料が請求書に二重に計上されています。",
            "refund,double::返金は口座{iban}にお振込みください。",
            "dispute,gt::弊社の計算では、正しい金額は{amount2}です。",
            "reminder,refund,double::振込明細の写しを添付いたします。",
            "弊社の顧客番号は{custno}です。",
        ],
        "ask": [
            "dispute,gt,double::差額分の訂正請求書またはクレジットノートを発行していただけますでしょうか。",
            "reminder::入金をご確認のうえ、督促を取り消していただけますようお願いいたします。",
            "dispute,gt::請求書{ref_inv}の明細をお送りいただけますと幸いです。",
            "change::顧客情報の更新をお願いいたします。",
            "refund::14日以内に返金のお手続きをお願いいたします。",
        ],
        "mention": [
            "当該寄港の入港料はすでに全額支払済みです（請求書{ref_inv}）。",
            "料金{amount}は{date}に支払っております。",
        ],
    },
    "marina": {
        "subject": [
            "apply::シーズン係留の申込み（{yacht}）",
            "wait,apply::マリーナ待機リストの順番について（{ref_mar}）",
            "visit::「{yacht}」ビジター係留のお願い（{n}泊）",
            "winter::「{yacht}」冬季陸置きの申込み",
            "power::{pontoon}の電源が使えません",
            "renew::係留許可{ref_mar}の更新について",
        ],
        "open": [
            "apply::私のヨット「{yacht}」のため、マリーナのシーズン係留を申し込みたいと思います。",
            "wait::マリーナ待機リストでの現在の順番を教えていただけますでしょうか。受付番号は{ref_mar}です。",
            "visit::{fdate}に「{yacht}」でポートベルマーへ寄港する予定で、{n}泊分のビジターバースをお願いしたいです。",
            "winter::{fmonth}から「{yacht}」の冬季陸置きをお願いしたく、ご連絡しました。",
            "power::{date}から{pontoon}の電源が使えない状態です。",
            "renew::係留許可{ref_mar}が{month}で期限切れとなるため、更新を希望します。",
        ],
        "detail": [
            "!power::艇は全長{yachtlen}m、喫水{ydraft}mの[セーリングヨット|カタマラン|モーターボート]です。",
            "wait,apply::{wlyear}年から待機リストに登録していますが、その後連絡がありません。",
            "renew,power,wait::現在の係留場所は{pontoon}の{mooring}です。",
            "apply,visit,renew,winter::{fdate}まで有効の保険証書を添付します。",
            "visit,apply::滞在中は陸電と給水を利用したいです。",
            "renew,apply,winter,wait::昨シーズンの係留料は{amount}でしたが、料金に変更はありますか。",
            "visit::乗員は{n}名です。",
            "power::{pontoon}のクリートがいくつか緩んでいて危険です。",
            "{club}の会員です。",
        ],
        "ask": [
            "apply,wait,visit,winter::空きがあるかどうかと料金を教えていただけますでしょうか。",
            "apply,renew,winter::申込書と料金表をお送りいただけますか。",
            "visit,winter::「{yacht}」の名前でビジターバースの予約をお願いいたします。",
            "power::今週中に点検していただけると助かります。",
        ],
        "mention": [
            "!gt,!days,!double,!passes,!change::私の艇「{yacht}」はマリーナの{pontoon}に係留しています。",
            "!passes,!badge,!gate,!dispute,!gt,!days,!double,!reminder,!refund,!change::マリーナの桟橋のすぐそばでの出来事でした。",
        ],
    },
    "environment": {
        "subject": [
            "spill::{berth}付近の油膜について",
            "noise::コンテナターミナルの夜間騒音について",
            "dredge::浚渫工事に関する苦情",
            "dust::[穀物|石炭]荷役による粉じんについて",
            "fish::港内での魚の大量死について",
            "smoke::「{ship}」の黒煙について",
        ],
        "open": [
            "spill::[今朝|昨夜]、{berth}付近の海面に油膜が広がっているのを見つけましたので、ご報告します。",
            "noise::[またしても|三晩続けて]、深夜にコンテナターミナルの騒音で目が覚めました。",
            "dredge::{quay}付近で浚渫が始まってから、海水が[茶色く|濁って]悪臭がしています。",
            "dust::{street}の住民は、{berth}での荷役による粉じんに悩まされています。",
            "fish::今朝、内港で[多数の|何匹もの]魚が死んで浮いているのを見つけました。",
            "smoke::{berth}に着岸中の「{ship}」が、何時間も黒煙を出し続けています。",
        ],
        "detail": [
            "spill::油膜は長さ約{size}メートルで、虹色に光り、軽油のにおいがしました。",
            "写真と動画を撮影しましたので、お送りできます。",
            "noise::騒音は寝室の窓際で約{db}デシベルありました。",
            "dust::毎朝、車や窓が灰色の粉じんで覆われています。",
            "spill,fish::ビルジ水やバラスト水の排出が原因ではないでしょうか。",
            "spill,fish::マリーナ近くで油にまみれたカモメを見ました。",
            "dust,smoke::子どもに喘息があり、排気ガスで症状が悪化しています。",
            "{time}に港の事務所へ電話しましたが、誰も出ませんでした。",
            "noise,dust,smoke::ここ数週間、ほぼ毎晩このような状態です。",
        ],
        "ask": [
            "調査のうえ、どのような対策を取るのかお知らせください。",
            "spill,fish,dredge::その週の水質データを提供していただけますでしょうか。",
            "noise,dust,smoke::原因が明らかになるまで、夜間作業を制限していただくようお願いします。",
            "本件の受付番号をお知らせください。",
        ],
        "mention": [
            "その日は{berth}付近で強い軽油のにおいもしました。",
            "その週は{quay}沖で浚渫船が作業していました。",
        ],
    },
    "security-incidents": {
        "subject": [
            "badge::入構証{badge}紛失のご連絡",
            "theft::{pontoon}での船外機盗難について",
            "trespass::{quay}への不審者侵入について",
            "gate::{gate}が閉まらない件",
            "passes::臨時入構証発行のお願い（「{ship}」作業員）",
        ],
        "open": [
            "badge::{date}に、{gate}と駐車場の間で入構証（番号{badge}）を紛失しました。",
            "theft::昨夜、{pontoon}に係留中の私の艇から船外機が盗まれました。",
            "trespass::{date}、{quay}付近でフェンスを乗り越えた若者数名がコンテナの間を歩き回っていました。",
            "gate::{gate}の遮断機が[二日前から|{date}から]閉まらなくなっています。",
            "passes::{fdate}より「{ship}」船上で作業する技術者{n}名分の臨時入構証を発行していただきたいです。",
        ],
        "detail": [
            "badge::入構証は{company}の{name}名義です。",
            "theft,badge,trespass::警察に被害届を提出済みで、受理番号は{polref}です。",
            "theft::船外機は{hp}馬力、製造番号は{serial}です。",
            "theft::南京錠が切断され、ロッカーがこじ開けられていました。",
            "theft,trespass,gate::{gate}の防犯カメラに映っているはずです。",
            "trespass::けが人はいませんでした。",
            "theft::今月、{pontoon}での盗難はこれで二件目です。",
            "gate,trespass::入構証がなくても誰でも車で入れてしまいます。",
            "passes::船上作業は約{n}日間の予定です。",
        ],
        "ask": [
            "badge::紛失した入構証を無効にし、再発行をお願いいたします。",
            "theft,trespass::当夜の防犯カメラの映像を確認していただけますでしょうか。",
            "gate::至急、遮断機の修理をお願いします。",
            "theft,badge::保険請求のため、事案番号を教えてください。",
            "passes::入構証の受け取り日時をお知らせください。",
        ],
        "mention": [
            "{gate}を通る際に入構証を提示しました。",
            "すぐに警備員に知らせました。",
        ],
    },
    "records-requests": {
        "subject": [
            "new::行政文書開示請求（{rrtopic}）",
            "new::公文書の開示請求について",
            "chase,review::開示請求{ref_rr}の回答について（催促）",
        ],
        "open": [
            "new::公文書アクセス条例に基づき、{rrdoc}の写しの開示を請求します。",
            "new::私は[記者|研究者|大学院生]で、{rrtopic}に関する情報の提供をお願いしたく存じます。",
            "chase::{date}に開示請求（受付番号{ref_rr}）を提出しましたが、まだ回答をいただいておりません。",
            "review::請求{ref_rr}に対する不開示決定について、再審査を求めます。",
        ],
        "detail": [
            "new::可能であれば電子データでの提供を希望します。",
            "new,review::個人情報は黒塗りしていただいて構いません。",
            "new::対象期間は{year}年から2026年までです。",
            "new,chase::条例では{ndays}営業日以内に回答することになっていると理解しています。",
            "new::手数料が発生する場合は事前にお知らせください。",
            "住民の関心が高く、公益性のある情報だと考えます。",
        ],
        "ask": [
            "new::本請求の受領をご確認のうえ、受付番号をお知らせください。",
            "法定期間内のご回答をお待ちしております。",
        ],
        "mention": [
            "この件に関する文書の開示も、改めて請求するかもしれません。",
        ],
    },
    "careers": {
        "subject": [
            "apply::{position}への応募（{ref_hr}）",
            "求人への応募について",
            "apply::履歴書送付の件（{position}）",
        ],
        "open": [
            "apply::貴局ウェブサイトに掲載されていた{position}の求人に応募いたします。",
            "apply::{position}の募集につきまして、履歴書と職務経歴書をお送りいたします。",
            "spec::港湾局での勤務を希望しており、現在募集中の職種があるかお伺いしたくご連絡しました。",
        ],
        "detail": [
            "港湾関係の業務に{n}年間従事してまいりました。",
            "現在は{company}に勤務しております。",
            "すぐに勤務を開始できます。",
            "交替勤務や休日勤務にも対応可能です。",
            "日本語と英語が話せます。",
            "必要であれば推薦状をお送りいたします。",
        ],
        "ask": [
            "ぜひ面接の機会をいただけますと幸いです。",
            "ご検討のほど、よろしくお願い申し上げます。",
        ],
        "mention": [
            "なお、息子が港での仕事に興味を持っております。",
        ],
    },
}
JA_RECORDS = [
    ("港湾委員会議事録", "{year}年の港湾委員会の議事録"),
    ("浚渫契約", "内港航路の浚渫工事契約書"),
    ("バース割当て", "{year}年のバース割当て統計"),
    ("水質", "{quay}地区の環境モニタリング報告書"),
    ("港内の保安事案", "{year}年に記録された保安事案の件数"),
    ("入港料の値上げ", "{year}年以降の入港料表の改定履歴"),
    ("マリーナ拡張計画", "マリーナ拡張工事の予算書"),
]

BANKS = {"en": EN, "es": ES, "de": DE, "ja": JA}
RECORDS = {"en": EN_RECORDS, "es": ES_RECORDS, "de": DE_RECORDS, "ja": JA_RECORDS}


def _career_field(key):
    def draw(c):
        return expand(c, c.rng.choice(EN_CAREER_FIELDS[key]))
    return draw


for _key in EN_CAREER_FIELDS:
    FIELDS[_key] = _career_field(_key)
FIELDS["rrpair"] = lambda c: c.rng.randrange(len(RECORDS[c.lang]))
FIELDS["rrtopic"] = lambda c: expand(c, RECORDS[c.lang][c.get("rrpair")][0])
FIELDS["rrdoc"] = lambda c: expand(c, RECORDS[c.lang][c.get("rrpair")][1])
FIELDS["rrdoc2"] = lambda c: expand(c, RECORDS[c.lang][c.rng.choice(
    [i for i in range(len(RECORDS[c.lang])) if i != c.get("rrpair")])][1])
FIELDS["child"] = lambda c: c.rng.choice(["son", "daughter"])
FIELDS["he"] = lambda c: "He" if c.get("child") == "son" else "She"
FIELDS["age"] = lambda c: str(c.rng.randint(16, 19))
FIELDS["airdraft"] = lambda c: str(c.rng.randint(24, 48))


# ---------------------------------------------------------------------------
# Frames shared by all queues: greetings, closings, filler sentences,
# disclaimers, signature titles.

FRAME = {
    "en": {
        "greet_formal": ["Dear Sir or Madam,", "Dear Sir/Madam,", "To whom it may concern,",
                         "Dear Harbour Authority,", "Dear colleagues,", "Dear Sirs,"],
        "greet_casual": ["Hello,", "Hi,", "Good morning,", "Good afternoon,", "Hi there,",
                         "Hello team,", "Morning,"],
        "close_formal": ["Yours faithfully,", "Yours sincerely,", "Kind regards,",
                         "With kind regards,"],
        "close_casual": ["Best regards,", "Regards,", "Many thanks,", "Thanks,", "Best wishes,",
                         "Cheers,", "BR,", "Thanks and regards,", "Kind regards"],
        "filler": [
            "I have tried to [call|phone] [the office|your office] [several times|twice] [without success|but the line was busy].",
            "[Apologies|Sorry] for the [long|late] [email|message].",
            "[Thank you|Thanks] in advance for your [help|assistance].",
            "I look forward to hearing from you.",
            "[If you have|Should you have] any questions, [please|do not hesitate to] contact me [on|at] {phone}.",
            "[Please|Kindly] reply to [this address|the address below] [rather than|and not] my [personal|old] e-mail.",
            "[This is|It is] [rather|quite|very] urgent[, as you can imagine|].",
            "company::[I am|I'm] copying [my colleague|our operations manager] {name2}.",
            "[We have|I have] [dealt with|worked with] the port for [many|several] years [and never had this problem|without any issues].",
            "[I hope|Hope] this is the right address[ for this|].",
            "[Please|Kindly] [forward|pass] this to the right [department|person] if it is not for you.",
            "[Please|Kindly] [note|be aware] that I am out of the office [from|after] {fdate}.",
        ],
        "disclaimer": [
            "This e-mail and any attachments are confidential and intended solely for the addressee. If you have received it in error, please notify the sender and delete it.",
            "Please consider the environment before printing this e-mail.",
            "company::{company} is registered in Port Velmar under company number {custno}.",
            "Sent from my phone",
            "Sent from my iPad",
        ],
        "also": ["Separately,", "On another matter,", "Also,", "While I am writing,",
                 "One more thing:", "In addition,"],
    },
    "es": {
        "greet_formal": ["Estimados señores:", "Muy señores míos:", "Estimada Autoridad Portuaria:",
                         "A quien corresponda:"],
        "greet_casual": ["Buenos días:", "Hola:", "Buenas tardes:", "Hola, buenos días:"],
        "close_formal": ["Atentamente,", "Reciban un cordial saludo,", "Sin otro particular, les saluda atentamente,"],
        "close_casual": ["Un cordial saludo,", "Saludos cordiales,", "Saludos,", "Un saludo,"],
        "filler": [
            "Quedo a la espera de su respuesta.",
            "Gracias de antemano por su ayuda.",
            "He intentado llamar varias veces sin éxito.",
            "Disculpen las molestias.",
            "Para cualquier consulta, pueden llamarme al {phone}.",
            "El asunto es bastante urgente.",
            "company::Pongo en copia a mi compañero {name2}.",
        ],
        "disclaimer": [
            "Este mensaje y sus anexos son confidenciales y están dirigidos exclusivamente a su destinatario. Si lo ha recibido por error, le rogamos que lo comunique al remitente y lo elimine.",
            "Antes de imprimir este correo, piense en el medio ambiente.",
            "Enviado desde mi móvil",
        ],
        "also": ["Por otra parte,", "Además,", "Aprovecho para comentarles que"],
    },
    "de": {
        "greet_formal": ["Sehr geehrte Damen und Herren,", "Sehr geehrtes Team der Hafenbehörde,"],
        "greet_casual": ["Guten Tag,", "Hallo,", "Moin,", "Hallo zusammen,"],
        "close_formal": ["Mit freundlichen Grüßen", "Mit freundlichem Gruß"],
        "close_casual": ["Freundliche Grüße", "Viele Grüße", "Beste Grüße", "MfG", "Gruß"],
        "filler": [
            "Für Rückfragen stehe ich gern zur Verfügung.",
            "Vielen Dank im Voraus.",
            "Ich habe bereits mehrfach versucht, Sie telefonisch zu erreichen.",
            "Die Angelegenheit ist leider dringend.",
            "Sie erreichen mich unter {phone}.",
            "company::Meinen Kollegen {name2} habe ich in Kopie gesetzt.",
        ],
        "disclaimer": [
            "Diese E-Mail enthält vertrauliche Informationen. Wenn Sie nicht der richtige Adressat sind, informieren Sie bitte sofort den Absender und löschen Sie diese E-Mail.",
            "Bitte denken Sie an die Umwelt, bevor Sie diese E-Mail ausdrucken.",
            "Von meinem Smartphone gesendet",
        ],
        "also": ["Außerdem:", "Noch etwas:", "Unabhängig davon:"],
    },
    "ja": {
        "greet_formal": ["ポートベルマー港湾局 御中", "港湾局 ご担当者様", "ご担当者様"],
        "greet_casual": ["ご担当者様", "港湾局 ご担当者様"],
        "close_formal": ["以上、よろしくお願い申し上げます。", "何卒よろしくお願い申し上げます。"],
        "close_casual": ["よろしくお願いいたします。", "ご確認のほど、よろしくお願いいたします。"],
        "filler": [
            "何度かお電話いたしましたが、つながりませんでした。",
            "お手数をおかけしますが、ご対応のほどお願いいたします。",
            "ご不明な点がございましたら、{phone}までご連絡ください。",
            "急ぎの案件のため、早めのご回答をいただけますと助かります。",
        ],
        "disclaimer": [
            "本メールには機密情報が含まれている場合があります。誤って受信された場合は、送信者にご連絡のうえ削除してください。",
            "iPhoneから送信",
        ],
        "also": ["また、", "それから、", "別件ですが、"],
        "intro": ["いつもお世話になっております。", "突然のご連絡失礼いたします。", "お世話になっております。"],
    },
}

TITLES = {
    "berth-bookings": ["Operations Manager", "Port Agent", "Master", "Chief Officer",
                       "Marine Superintendent", "Port Captain", "Husbandry Agent"],
    "cargo-customs": ["Documentation Clerk", "Customs Broker", "Import Coordinator",
                      "DG Coordinator", "Export Manager"],
    "billing": ["Accounts Payable", "Finance Manager", "Credit Controller", "Accounts Assistant"],
    "security-incidents": ["Site Manager", "Facilities Manager", "Operations Supervisor",
                           "Project Engineer"],
    "environment": ["Environmental Manager", "Operations Manager"],
    "records-requests": ["Reporter", "Research Fellow", "Editor"],
    "marina": ["Skipper", "Yacht Manager"],
    "careers": [],
}
# Titles a private person signs with, if any.
PRIVATE_TITLES = {
    "environment": ["Chair, Ropewalk Residents' Association", "Secretary, Friends of Velmar Foreshore"],
    "records-requests": ["Reporter, the Velmar Gazette", "Councillor", "Research student"],
    "marina": ["Skipper", "Owner"],
}
SHARED_TITLES = ["Operations Manager", "Director", "Office Manager", "Managing Director",
                 "Assistant", "Coordinator", "Manager"]
FOREIGN_TITLES = {
    "es": ["Departamento de Operaciones", "Dpto. de Administración", "Gerente", "Jefe de Tráfico"],
    "de": ["Disposition", "Buchhaltung", "Geschäftsführer", "Abteilung Schiffsabfertigung"],
    "ja": ["運航管理部", "経理部", "業務課", "営業部"],
}
ENQUIRY_TYPES = ["General enquiry", "Other", "Question", "Request", "Complaint",
                 "Feedback", "General enquiry"]
# The web form's topic list. Senders pick the right topic only some of the
# time; the rest choose a general one, or a neighbouring one.
FORM_TOPICS = {
    "berth-bookings": "Berths and pilotage",
    "billing": "Invoices and payments",
    "cargo-customs": "Cargo and customs",
    "marina": "Marina and moorings",
    "environment": "Environment",
    "security-incidents": "Port security",
    "records-requests": "Access to information",
    "careers": "Jobs and careers",
}
P_FORM_TOPIC_RIGHT = 0.35
P_FORM_TOPIC_NEIGHBOUR = 0.10

# File names of e-mail attachments, per queue and language.
ATTACHMENTS = {
    "berth-bookings": ["pre-arrival_{imo}.pdf", "ship_particulars.pdf", "crew_list.xlsx",
                       "ISPS_declaration.pdf", "berth_application.pdf"],
    "billing": ["remittance_advice.pdf", "payment_confirmation.pdf", "tonnage_certificate.pdf",
                "statement.pdf", "new_bank_details.pdf"],
    "cargo-customs": ["manifest_rev2.pdf", "DG_declaration.pdf", "SDS.pdf", "packing_list.xlsx",
                      "commercial_invoice.pdf", "B_L_copy.pdf"],
    "marina": ["insurance_certificate.pdf", "boat_photo.jpg", "mooring_application.pdf",
               "registration_certificate.pdf"],
    "environment": ["IMG_{n}{n}{n}.jpg", "VID_{n}{n}{n}.mp4", "photo1.jpg", "noise_readings.xlsx"],
    "security-incidents": ["police_report.pdf", "IMG_{n}{n}{n}.jpg", "contractor_list.xlsx",
                           "incident_form.pdf"],
    "records-requests": ["request_letter.pdf", "previous_reply.pdf"],
    "careers": ["CV_{last}.pdf", "Cover_letter.pdf", "certificates.pdf", "CV.docx",
                "references.pdf"],
}
ATTACHMENTS_LOCAL = {
    "es": {"careers": ["CV_{last}.pdf", "carta_presentacion.pdf"], "billing": ["justificante.pdf"],
           "cargo-customs": ["manifiesto.pdf"], "marina": ["seguro.pdf"]},
    "de": {"careers": ["Lebenslauf_{last}.pdf", "Anschreiben.pdf", "Zeugnisse.pdf"],
           "billing": ["Ueberweisung.pdf"], "cargo-customs": ["Manifest_korrigiert.pdf"],
           "marina": ["Versicherung.pdf"]},
    "ja": {"careers": ["履歴書.pdf", "職務経歴書.pdf"], "billing": ["振込明細.pdf"],
           "cargo-customs": ["マニフェスト訂正版.pdf"]},
}
P_ATTACHMENT = {"careers": 0.85, "records-requests": 0.15}
P_ATTACHMENT_DEFAULT = 0.30
RECEPTION = ["Maureen", "Kofi", "Idris", "Janet", "Pavel", "Orla"]


# ---------------------------------------------------------------------------
# The sender

class Sender:
    def __init__(self, rng, lang, queue, private_share):
        origin = lang
        if lang == "en" and rng.random() < P_FOREIGN_SENDER:
            origin = rng.choice(FOREIGN_LANGS)
        self.origin = origin
        self.private = rng.random() < private_share
        native = person(rng, origin)
        self.name = native if lang == origin else roman(native)
        if self.private:
            self.company = ""
        elif origin == "ja" and lang != "ja":
            x = JA_COMPANY_ROMAN[rng.choice(JA_COMPANY_X)]
            self.company = rng.choice(["{} Kaiun Co., Ltd.", "{} Marine Co., Ltd.",
                                       "{} Shipping Co., Ltd."]).format(x)
        else:
            self.company = company(rng, origin)
        if lang == "en":
            pool = PRIVATE_TITLES.get(queue, []) if self.private else TITLES[queue] + SHARED_TITLES
            self.title = rng.choice(pool) if pool and rng.random() < 0.6 else ""
        else:
            self.title = rng.choice(FOREIGN_TITLES[lang]) if not self.private and rng.random() < 0.6 else ""
        latin = roman(native) if origin == "ja" else native
        parts = mailbox_of(latin)
        first, last = parts[0], parts[-1]
        local = rng.choice([f"{first}.{last}", f"{first[0]}{last}", f"{first}", f"{last}.{first[0]}",
                            f"{first}{rng.randint(1, 99)}"])
        if self.company:
            domain = domain_of(self.company)
            if rng.random() < 0.3:
                local = rng.choice(["ops", "accounts", "info", "docs", "office", "agency"])
        else:
            domain = rng.choice(["mailbox.example", "velmarnet.example", "post.example",
                                 "seamail.example", "home.example"])
        self.email = f"{local}@{domain}"
        self.phone = phone(rng)
        self.street = f"{rng.randint(1, 140)} {rng.choice(STREETS)}"
        self.town = rng.choice(TOWNS)
        self.postcode = f"PV{rng.randint(1, 9)} {rng.randint(1, 9)}{rng.choice('ABDEFGHJLNPQRSTUWXY')}{rng.choice('ABDEFGHJLNPQRSTUWXY')}"


# ---------------------------------------------------------------------------
# Bodies

# Document sizes: how often each occurs, and how many detail sentences it
# carries. Job applications, records requests and incident reports run
# longer than berth requests, as they do in life.
SIZES = [("terse", 0.10), ("short", 0.28), ("medium", 0.40), ("long", 0.22)]
LONG_WINDED_SIZES = [("terse", 0.03), ("short", 0.15), ("medium", 0.45), ("long", 0.37)]
LONG_WINDED = {"careers", "records-requests", "security-incidents", "environment"}
DETAILS_BY_SIZE = {"terse": (0, 1), "short": (1, 3), "medium": (3, 5), "long": (5, 8)}


def weighted(rng, pairs):
    x = rng.random() * sum(w for _, w in pairs)
    for value, w in pairs:
        x -= w
        if x < 0:
            return value
    return pairs[-1][0]


def compose_body(ctx, lang, queue, size, mixed_with):
    """Returns (paragraphs, scenario): the body as a list of paragraphs, each
    a list of sentences, and the scenario its opening set."""
    rng = ctx.rng
    bank = BANKS[lang][queue]
    opener_item = rng.choice(bank["open"])
    scenario = scenario_of(opener_item)
    opener = expand(ctx, split_tags(opener_item)[2])
    lo, hi = DETAILS_BY_SIZE[size]
    details = [expand(ctx, s) for s in choose(rng, bank["detail"], scenario, rng.randint(lo, hi))]
    if MENTIONS[queue] and rng.random() < P_MENTION:
        other = BANKS[lang][rng.choice(MENTIONS[queue])]
        details.insert(rng.randint(0, len(details)), expand(ctx, choose(rng, other["mention"], scenario)))
    ask = ([expand(ctx, choose(rng, bank["ask"], scenario))]
           if size == "terse" or rng.random() < 0.85 else [])
    if size == "terse":
        return [[opener] + details[:1] + ask[: rng.randint(0, 1)]], scenario
    n_fill = {"short": rng.randint(0, 1), "medium": rng.randint(0, 2), "long": rng.randint(1, 2)}[size]
    kind = "company" if ctx.get("sender_company") else "private"
    fillers = [expand(ctx, s) for s in choose(rng, FRAME[lang]["filler"], kind, n_fill)]
    # Group into paragraphs: the opening with the first details, the rest,
    # then the request and the pleasantries.
    cut = rng.randint(0, len(details))
    paragraphs = [[opener] + details[:cut]]
    if details[cut:]:
        paragraphs.append(details[cut:])
    if mixed_with:
        other = BANKS[lang][mixed_with]
        other_item = rng.choice(other["open"])
        other_scenario = scenario_of(other_item)
        extra = [expand(ctx, split_tags(other_item)[2])]
        extra += [expand(ctx, s) for s in choose(rng, other["detail"], other_scenario, rng.randint(0, 1))]
        if rng.random() < 0.3:
            extra.append(expand(ctx, choose(rng, other["ask"], other_scenario)))
        also = rng.choice(FRAME[lang]["also"])
        if lang == "ja":
            extra[0] = also + extra[0]
        elif also.endswith(":") or lang == "de":
            extra[0] = also + " " + extra[0]
        else:
            extra[0] = also + " " + extra[0][0].lower() + extra[0][1:]
        paragraphs.insert(rng.randint(1, len(paragraphs)), extra)
    tail = ask + fillers
    if tail:
        if rng.random() < 0.5 or len(paragraphs) == 1:
            paragraphs.append(tail)
        else:
            paragraphs[-1] = paragraphs[-1] + tail
    return paragraphs, scenario


# Characters that Japanese typesetting keeps off the start of a line
# (kinsoku shori, common practice).
NO_LINE_START = set("。、，．・）」』】！？ー")


def wrap_japanese(text, width):
    """Fills lines up to width display columns (wide characters count two),
    keeping runs of Latin letters and digits whole."""
    units = re.findall(r"[!-~]+|.", text)
    lines, line, used = [], "", 0
    for unit in units:
        cols = sum(2 if unicodedata.east_asian_width(ch) in "WF" else 1 for ch in unit)
        if line and used + cols > width and unit[0] not in NO_LINE_START:
            lines.append(line)
            line, used = "", 0
        line += unit
        used += cols
    if line:
        lines.append(line)
    return "\n".join(lines)


def render_paragraphs(rng, lang, paragraphs, width):
    """Lays out paragraphs: wrapped at width, or one line each when width is 0."""
    out = []
    for para in paragraphs:
        if lang == "ja":
            if width == 0:
                out.append("\n".join(para))
            else:
                out.append(wrap_japanese("".join(para), width))
        else:
            text = " ".join(para)
            out.append(textwrap.fill(text, width) if width else text)
    return "\n\n".join(out)


# ---------------------------------------------------------------------------
# Noise

NEIGHBOURS = {"a": "sq", "e": "wr", "i": "uo", "o": "ip", "n": "bm", "r": "et", "s": "ad",
              "t": "ry", "l": "k", "c": "xv", "d": "sf", "m": "n", "u": "yi", "h": "gj"}


def add_typos(rng, text, rate):
    """Typing mistakes: swapped, dropped, doubled or neighbouring letters."""
    def typo(m):
        w = m.group(0)
        if rng.random() >= rate:
            return w
        i = rng.randrange(1, len(w) - 1)
        kind = rng.randrange(4)
        if kind == 0:
            return w[:i] + w[i + 1] + w[i] + w[i + 2:]
        if kind == 1:
            return w[:i] + w[i + 1:]
        if kind == 2:
            return w[:i] + w[i] + w[i:]
        near = NEIGHBOURS.get(w[i].lower())
        return w[:i] + (rng.choice(near) if near else w[i]) + w[i + 1:]
    return re.sub(r"[^\W\d_]{5,}", typo, text)


LATIN_OCR = [("rn", "m", 0.35), ("m", "rn", 0.04), ("l", "1", 0.05), ("I", "l", 0.2),
             ("O", "0", 0.25), ("0", "O", 0.08), ("e", "c", 0.015), ("h", "b", 0.015),
             ("cl", "d", 0.2), ("ü", "u", 0.3), ("ß", "B", 0.4), ("é", "e", 0.3),
             ("fi", "\ufb01", 0.2), ("vv", "w", 0.5), ("w", "vv", 0.03), (",", ".", 0.05),
             ("S", "5", 0.03), ("t", "f", 0.01)]
KANA_OCR = [("ー", "一", 0.3), ("ロ", "口", 0.4), ("カ", "力", 0.4), ("エ", "工", 0.4),
            ("ニ", "二", 0.3), ("ハ", "八", 0.3), ("ト", "卜", 0.3), ("。", "o", 0.03)]
STRAY = ["~", "`", "¦", "'", "°", "^", "•", "|", ".", ",", "«", "_", ";"]


def ocr_noise(rng, text, level, lang):
    """What a scanner's text recognition makes of a printed page: confused
    glyphs, stray marks, words broken across lines (with and without a
    hyphen), lost or added spaces. level 1 is light, 2 heavy."""
    scale = 1.0 if level == 1 else 2.5
    for src, dst, p in (KANA_OCR if lang == "ja" else LATIN_OCR):
        parts = text.split(src)
        text = parts[0] + "".join((dst if rng.random() < p * scale else src) + part
                                  for part in parts[1:])
    lines = []
    for line in text.split("\n"):
        if lang != "ja" and len(line) > 30 and rng.random() < 0.12 * scale:
            words = line.split(" ")
            k = rng.randrange(len(words))
            w = words[k]
            if len(w) >= 6 and w.isalpha():
                cut = rng.randint(2, len(w) - 3)
                joiner = "-\n" if rng.random() < 0.6 else "\n"
                words[k] = w[:cut] + joiner + w[cut:]
                line = " ".join(words)
        elif lang == "ja" and len(line) > 12 and rng.random() < 0.1 * scale:
            cut = rng.randint(4, len(line) - 4)
            line = line[:cut] + "\n" + line[cut:]
        chars = []
        for ch in line:
            r = rng.random()
            if r < 0.004 * scale:
                chars.append(rng.choice(STRAY))
            if ch == " " and r > 1 - 0.01 * scale:
                continue
            chars.append(ch)
            if ch.isalpha() and rng.random() < 0.002 * scale and lang != "ja":
                chars.append(" ")
        lines.append("".join(chars))
    text = "\n".join(lines)
    if rng.random() < 0.3 * scale:
        text += rng.choice(["\n\n- 1 -", "\n\nPage 1 of 1", "\n\n1/1", "\n\n.", "\n\n' ;"])
    return text


# ---------------------------------------------------------------------------
# Frames: e-mail, letter, web form, telephone note, fax

def rfc_date(when, hour, minute, second):
    offset = "+0100" if when.month < 11 and when >= datetime.date(when.year, 3, 29) else "+0000"
    return (f"{EN_DAYS[when.weekday()]}, {when.day} {EN_MONTHS_SHORT[when.month - 1]} {when.year} "
            f"{hour:02d}:{minute:02d}:{second:02d} {offset}")


def greeting(rng, lang, formal):
    return rng.choice(FRAME[lang]["greet_formal" if formal else "greet_casual"])


def closing(rng, lang, formal):
    return rng.choice(FRAME[lang]["close_formal" if formal else "close_casual"])


def signature(rng, ctx, sender, lang, full):
    lines = [sender.name if rng.random() < 0.85 or lang == "ja" else sender.name.split(" ")[0]]
    if sender.title:
        lines.append(sender.title)
    if sender.company:
        lines.append(sender.company)
    if full:
        if rng.random() < 0.4:
            lines.append(f"{sender.street}, {sender.town}")
        label = {"en": rng.choice(["Tel.", "T:", "Phone:", "Mob.", "M:"]), "es": "Tel.",
                 "de": rng.choice(["Tel.", "Telefon:", "Mobil:"]), "ja": "TEL:"}[lang]
        lines.append(f"{label} {sender.phone}")
        if rng.random() < 0.5:
            lines.append(sender.email)
    if lang == "ja" and full:
        lines.insert(0, "――――――――――――")
        lines.append("――――――――――――")
    elif full and rng.random() < 0.3:
        lines.insert(0, "--")
    return "\n".join(lines)


def quoted_reply(rng, ctx, queue, lang, when):
    """The Authority's earlier answer, quoted under the sender's text."""
    r = rng.random()
    if r < 0.75:
        source = queue
    elif r < 0.85 and SECOND_MATTER[queue]:
        source = rng.choice(SECOND_MATTER[queue])
    else:
        source = None
    if source is None:
        text = ("Thank you for contacting the Harbour Authority of Port Velmar. Your message has "
                "been received and will be passed to the right team.")
    else:
        text = expand(ctx, choose(rng, EN[source]["reply"], None))
    sign = rng.choice(["Harbour Authority of Port Velmar", "Port Velmar Enquiries",
                       "Harbour Master's Office", "Customer Services, Harbour Authority of Port Velmar"])
    body = textwrap.fill(text, 70) + "\n\n" + sign
    earlier = when - datetime.timedelta(days=rng.randint(1, 12))
    mailbox = rng.choice(AUTHORITY_MAILBOXES)
    hh, mm, ss = rng.randint(7, 17), rng.randint(0, 59), rng.randint(0, 59)
    if rng.random() < 0.5:
        head = f"On {rfc_date(earlier, hh, mm, ss)[:-6]}, Port Velmar <{mailbox}> wrote:"
        return head + "\n" + "\n".join(("> " + l) if l else ">" for l in body.split("\n"))
    labels = {"en": ("-----Original Message-----", "From", "Sent", "To", "Subject"),
              "es": ("-----Mensaje original-----", "De", "Enviado", "Para", "Asunto"),
              "de": ("-----Ursprüngliche Nachricht-----", "Von", "Gesendet", "An", "Betreff"),
              "ja": ("-----Original Message-----", "From", "Sent", "To", "Subject")}[lang]
    head = "\n".join([labels[0], f"{labels[1]}: Port Velmar <{mailbox}>",
                      f"{labels[2]}: {earlier.isoformat()} {hh:02d}:{mm:02d}",
                      f"{labels[3]}: {ctx.get('sender_email')}",
                      f"{labels[4]}: {ctx.get('reply_subject')}"])
    return head + "\n\n" + body


def frame_email(rng, ctx, sender, lang, queue, subject, paragraphs, size, when, hm):
    formal = rng.random() < 0.45
    display = sender.name if rng.random() < 0.8 else (sender.company or sender.name)
    reply = size != "terse" and rng.random() < 0.22
    prefix = ""
    if reply:
        prefix = {"en": rng.choice(["RE: ", "Re: "]), "es": rng.choice(["RE: ", "Re: "]),
                  "de": rng.choice(["AW: ", "Re: "]), "ja": "Re: "}[lang]
    elif rng.random() < 0.05:
        prefix = {"en": "Fwd: ", "es": "RV: ", "de": "WG: ", "ja": "Fw: "}[lang]
    head = [f"From: {display} <{sender.email}>", f"To: {rng.choice(AUTHORITY_MAILBOXES)}"]
    if sender.company and rng.random() < 0.15:
        colleague = mailbox_of(roman(person(rng, sender.origin)))[0]
        head.append(f"Cc: {colleague}@{sender.email.split('@')[1]}")
    head.append(f"Date: {rfc_date(when, hm[0], hm[1], rng.randint(0, 59))}")
    head.append(f"Subject: {prefix}{subject}")
    if size != "terse" and rng.random() < P_ATTACHMENT.get(queue, P_ATTACHMENT_DEFAULT):
        names = ATTACHMENTS_LOCAL.get(lang, {}).get(queue) or ATTACHMENTS[queue]
        last = re.sub(r"\W", "", sender.name.split(" ")[-1 if lang != "ja" else 0]) or "CV"
        ctx.set("last", last)
        chosen = [expand(ctx, a) for a in rng.sample(names, rng.randint(1, min(2, len(names))))]
        head.append(rng.choice(["Attachments: ", "Attachment: ", "X-Attachments: "]) + ", ".join(chosen))
    parts = ["\n".join(head), ""]
    width = rng.choice([72, 76, 0, 0]) if lang != "ja" else 0
    if size == "terse":
        if rng.random() < 0.5 and lang != "ja":
            parts.append(greeting(rng, lang, False) + "\n")
        parts.append(render_paragraphs(rng, lang, paragraphs, width))
        parts.append("\n" + rng.choice([sender.name.split(" ")[0], sender.name,
                                          closing(rng, lang, False) + "\n" + sender.name.split(" ")[0]]))
        if rng.random() < 0.3:
            parts.append("\n" + FRAME[lang]["disclaimer"][-1])
        return "\n".join(parts)
    parts.append(greeting(rng, lang, formal))
    if lang == "ja":
        intro = rng.choice(FRAME["ja"]["intro"])
        who = f"{sender.company}の{sender.name.split(' ')[0]}です。" if sender.company else f"{sender.name}と申します。"
        parts.append("\n" + intro + who)
    parts.append("")
    parts.append(render_paragraphs(rng, lang, paragraphs, width))
    parts.append("")
    parts.append(closing(rng, lang, formal))
    parts.append(signature(rng, ctx, sender, lang, full=rng.random() < 0.6))
    if rng.random() < 0.25:
        kind = "company" if sender.company else "private"
        parts.append("\n" + expand(ctx, choose(rng, FRAME[lang]["disclaimer"], kind)))
    if reply:
        ctx.set("sender_email", sender.email)
        ctx.set("reply_subject", subject)
        parts.append("\n" + quoted_reply(rng, ctx, queue, lang, when))
    return "\n".join(parts)


def frame_letter(rng, ctx, sender, lang, queue, subject, paragraphs, size, when, fax=False):
    formal = rng.random() < 0.8
    width = rng.randint(66, 78) if lang != "ja" else rng.randint(60, 76)
    head = []
    if fax:
        head += [rng.choice(["FAX", "FAX MESSAGE", "TELEFAX", "Fax transmission"]),
                 f"To: {AUTHORITY}    Fax: (0712) 400 100",
                 f"From: {sender.company or sender.name}    Fax: {phone(rng)}",
                 f"Date: {fmt_date(ctx, when)}    Pages: {rng.randint(1, 4)} (incl. this page)",
                 f"Re: {subject}",
                 "-" * rng.randint(30, 60), ""]
    else:
        sender_block = [sender.company] if sender.company else []
        sender_block += [sender.name] if not sender.company else []
        sender_block += [sender.street, f"{sender.town} {sender.postcode}"]
        if rng.random() < 0.5:
            sender_block.append(f"Tel. {sender.phone}")
        head += sender_block + [""]
        if lang == "ja":
            head += [fmt_date(ctx, when), "", "ポートベルマー港湾局 御中", ""]
        else:
            head += [AUTHORITY] + AUTHORITY_ADDRESS + [""]
            head += [fmt_date(ctx, when), ""]
            if sender.company and rng.random() < 0.4:
                label = {"en": "Our ref:", "es": "N/Ref.:", "de": "Unser Zeichen:"}[lang]
                head += [f"{label} {ctx.get('ref_own')}", ""]
    body = []
    if lang == "ja":
        if not fax:
            body += [rng.choice(["件名：", "件名　", ""]) + subject, ""]
        body += [rng.choice(["拝啓　時下ますますご清栄のこととお喜び申し上げます。", "前略", "拝啓"]), ""]
        body.append(render_paragraphs(rng, lang, paragraphs, width))
        body += ["", rng.choice(["敬具", "草々", "以上"]), "", sender.company, sender.name]
    else:
        body.append(greeting(rng, lang, formal))
        body.append("")
        if not fax and rng.random() < 0.7:
            re_label = {"en": rng.choice(["Re: ", "RE: ", "Subject: ", ""]),
                        "es": rng.choice(["Asunto: ", "Ref.: "]),
                        "de": rng.choice(["Betreff: ", ""])}[lang]
            line = re_label + subject
            body += [line.upper() if rng.random() < 0.3 else line, ""]
        body.append(render_paragraphs(rng, lang, paragraphs, width))
        body += ["", closing(rng, lang, formal), ""]
        if rng.random() < 0.5:
            body.append(rng.choice(["(signed)", "[signature]", "pp.", ""]))
        body.append(sender.name)
        if sender.title:
            body.append(sender.title)
        if sender.company and fax:
            body.append(sender.company)
        if rng.random() < 0.2:
            body.append({"en": "Enc.", "es": "Anexos", "de": "Anlagen"}[lang])
    return "\n".join(head + body)


def frame_webform(rng, ctx, sender, lang, queue, subject, paragraphs, size, when, hm):
    lines = [rng.choice([f"{AUTHORITY} – online contact form",
                         "Port Velmar website: contact us",
                         "New submission: Contact the Harbour Authority"]),
             f"Submitted: {when.isoformat()} {hm[0]:02d}:{hm[1]:02d}",
             f"Name: {sender.name}",
             f"E-mail: {sender.email}"]
    if rng.random() < 0.6:
        lines.append(f"Telephone: {sender.phone}")
    if sender.company and rng.random() < 0.6:
        lines.append(f"Organisation: {sender.company}")
    r = rng.random()
    if r < P_FORM_TOPIC_RIGHT:
        topic = FORM_TOPICS[queue]
    elif r < P_FORM_TOPIC_RIGHT + P_FORM_TOPIC_NEIGHBOUR and SECOND_MATTER[queue]:
        topic = FORM_TOPICS[rng.choice(SECOND_MATTER[queue])]
    else:
        topic = rng.choice(ENQUIRY_TYPES)
    lines.append(f"Enquiry type: {topic}")
    lines.append(f"Subject: {subject}")
    lines.append("Message:")
    lines.append(render_paragraphs(rng, lang, paragraphs, 0))
    lines.append("")
    lines.append(f"Consent to processing of personal data: {rng.choice(['Yes', 'yes', 'Agreed'])}")
    if rng.random() < 0.5:
        lines.append(f"Form ID: {rng.randint(100000, 999999)}")
    return "\n".join(lines)


def frame_phone(rng, ctx, sender, lang, queue, subject, paragraphs, size, when, hm):
    sentences = [s for para in paragraphs for s in para][: rng.randint(2, 4)]
    said = re.sub(r"\bI am writing\b", "I am calling", " ".join(sentences))
    said = re.sub(r"\bI'm writing\b", "I'm calling", said)
    said = re.sub(r"\bI write\b", "I am calling", said)
    lines = [rng.choice(["TELEPHONE MESSAGE", "Phone message", "WHILE YOU WERE OUT"]),
             f"Date: {fmt_date(ctx, when)}    Time: {hm[0]:02d}:{hm[1]:02d}",
             f"Taken by: {rng.choice(RECEPTION)} (reception)",
             f"Caller: {sender.name}" + (f", {sender.company}" if sender.company else ""),
             f"Tel: {sender.phone}",
             textwrap.fill("Message: " + rng.choice(["Caller says: ", "", "Says: "]) + said, 76),
             rng.choice(["Please call back.", "Will call again.", "Urgent - please call back today.",
                         "For your information.", "Wants a reply by e-mail."])]
    return "\n".join(lines)


# ---------------------------------------------------------------------------
# Documents

FORMS = {
    "en": [("email", 0.50), ("letter", 0.20), ("webform", 0.14), ("phone", 0.08), ("fax", 0.08)],
    "es": [("email", 0.65), ("letter", 0.20), ("webform", 0.10), ("fax", 0.05)],
    "de": [("email", 0.65), ("letter", 0.20), ("webform", 0.10), ("fax", 0.05)],
    "ja": [("email", 0.70), ("letter", 0.20), ("webform", 0.10)],
}


class Document:
    def __init__(self, queue, lang, form, text, when, hm, noise, mixed_with):
        self.queue = queue
        self.lang = lang
        self.form = form
        self.text = text
        self.when = when
        self.hm = hm
        self.noise = noise          # "", "typos", "ocr-light", "ocr-heavy"
        self.mixed_with = mixed_with


def office_hours(rng):
    if rng.random() < 0.8:
        return rng.randint(7, 18), rng.randint(0, 59)
    return rng.randint(0, 23), rng.randint(0, 59)


def make_document(rng, queue, lang, mixed_with):
    private_share = dict((q[0], q[3]) for q in QUEUES)[queue]
    span = (LAST_DAY - FIRST_DAY).days
    when = FIRST_DAY + datetime.timedelta(days=rng.randint(0, span))
    if when.weekday() >= 5 and rng.random() < 0.7:
        when -= datetime.timedelta(days=when.weekday() - 4)
    hm = office_hours(rng)
    ctx = Ctx(rng, lang, when)
    sender = Sender(rng, lang, queue, private_share)
    ctx.set("sender_name", sender.name)
    ctx.set("sender_company", sender.company)
    form = weighted(rng, FORMS[lang])
    size = weighted(rng, LONG_WINDED_SIZES if queue in LONG_WINDED else SIZES)
    if mixed_with and size in ("terse", "short"):
        size = "medium"
    if form == "phone" and size == "long":
        size = "medium"
    paragraphs, scenario = compose_body(ctx, lang, queue, size, mixed_with)
    subject = expand(ctx, choose(rng, BANKS[lang][queue]["subject"], scenario))
    noise = ""
    if form in ("email", "webform") and lang != "ja" and rng.random() < P_TYPOS:
        rate = rng.choice([0.02, 0.04, 0.07])
        paragraphs = [[add_typos(rng, s, rate) for s in para] for para in paragraphs]
        noise = "typos"
    if form == "email":
        text = frame_email(rng, ctx, sender, lang, queue, subject, paragraphs, size, when, hm)
    elif form == "webform":
        text = frame_webform(rng, ctx, sender, lang, queue, subject, paragraphs, size, when, hm)
    elif form == "phone":
        text = frame_phone(rng, ctx, sender, lang, queue, subject, paragraphs, size, when, hm)
    else:
        text = frame_letter(rng, ctx, sender, lang, queue, subject, paragraphs, size, when,
                            fax=(form == "fax"))
        level = weighted(rng, [(0, 0.3), (1, 0.45), (2, 0.25)] if form == "letter"
                         else [(1, 0.5), (2, 0.5)])
        if level:
            text = ocr_noise(rng, text, level, lang)
            noise = "ocr-light" if level == 1 else "ocr-heavy"
    text = "\n".join(line.rstrip() for line in text.split("\n")).strip("\n") + "\n"
    return Document(queue, lang, form, text, when, hm, noise, mixed_with)


def language_plan(rng, count, share):
    """Languages for count documents: round(share * count) of them foreign,
    cycling through the foreign languages from a random start."""
    foreign = round(share * count)
    start = rng.randrange(len(FOREIGN_LANGS))
    langs = ["en"] * count
    for k, i in enumerate(sorted(rng.sample(range(count), foreign))):
        langs[i] = FOREIGN_LANGS[(start + k) % len(FOREIGN_LANGS)]
    return langs


def unique_document(rng, seen, queue, lang, mixed_with):
    while True:
        doc = make_document(rng, queue, lang, mixed_with)
        if doc.text not in seen:
            seen.add(doc.text)
            return doc


def inbox_name(rng, doc, used):
    w, (h, m) = doc.when, doc.hm
    while True:
        if doc.form == "email":
            name = f"mail-{w.isoformat()}-{h:02d}{m:02d}"
        elif doc.form == "webform":
            name = f"webform-{rng.randint(10000, 99999)}"
        elif doc.form == "phone":
            name = f"phone-{w.isoformat()}-{rng.randint(1, 40):02d}"
        elif doc.form == "fax":
            name = f"fax-{w.strftime('%Y%m%d')}-{rng.randint(1, 20):02d}"
        else:
            name = f"scan-{rng.randint(1, 9999):04d}"
        if name not in used:
            used.add(name)
            return name + ".txt"
        m = (m + 1) % 60


def generate(seed):
    rng = random.Random(seed)
    seen = set()
    labelled = []
    for queue, n_labelled, _, _ in QUEUES:
        langs = language_plan(rng, n_labelled, FOREIGN_SHARE)
        for lang in langs:
            mixed = (rng.choice(SECOND_MATTER[queue])
                     if SECOND_MATTER[queue] and rng.random() < P_MIXED_LABELLED else None)
            labelled.append(unique_document(rng, seen, queue, lang, mixed))
    plan = [q for q, _, n_inbox, _ in QUEUES for _ in range(n_inbox)]
    rng.shuffle(plan)
    langs = language_plan(rng, len(plan), FOREIGN_SHARE)
    mixable = [i for i, q in enumerate(plan) if SECOND_MATTER[q]]
    mixed_slots = set(rng.sample(mixable, round(P_MIXED_INBOX * len(plan))))
    inbox = []
    used = set()
    for i, (queue, lang) in enumerate(zip(plan, langs)):
        mixed = rng.choice(SECOND_MATTER[queue]) if i in mixed_slots else None
        doc = unique_document(rng, seen, queue, lang, mixed)
        doc.name = inbox_name(rng, doc, used)
        inbox.append(doc)
    return labelled, inbox


# ---------------------------------------------------------------------------
# Output

def write_text(path, text):
    os.makedirs(os.path.dirname(path), exist_ok=True)
    with open(path, "w", encoding="utf-8", newline="\n") as f:
        f.write(text)


def share(docs, pred):
    return sum(1 for d in docs if pred(d)) / len(docs)


def readme(seed, labelled, inbox):
    def pct(x):
        return f"{100 * x:.1f}%"

    everything = labelled + inbox
    rows = []
    for queue, _, _, _ in QUEUES:
        n_l = sum(1 for d in labelled if d.queue == queue)
        n_i = sum(1 for d in inbox if d.queue == queue)
        rows.append(f"| `{queue}` | {n_l} | {n_i} | {QUEUE_PURPOSE[queue]} |")
    lang_rows = []
    for lang in ["en"] + FOREIGN_LANGS:
        lang_rows.append(f"| {LANG_NAMES[lang]} | {sum(1 for d in labelled if d.lang == lang)} "
                         f"| {sum(1 for d in inbox if d.lang == lang)} "
                         f"| {pct(share(everything, lambda d, l=lang: d.lang == l))} |")
    form_names = {"email": "e-mails", "letter": "scanned letters", "webform": "web form submissions",
                  "phone": "telephone notes", "fax": "faxes"}
    forms = ", ".join(f"{form_names[f]} {pct(share(everything, lambda d, f=f: d.form == f))}"
                      for f in ["email", "letter", "webform", "phone", "fax"])
    total_bytes = sum(len(d.text.encode("utf-8")) for d in everything)
    lines_per_doc = sorted(d.text.count("\n") for d in everything)  # each line ends in \n
    bullets = [
        f"Forms: {forms}. Lengths run from {lines_per_doc[0]} to {lines_per_doc[-1]} lines "
        f"(median {lines_per_doc[len(lines_per_doc) // 2]}).",
        "Each document is assembled from many phrase variants per slot (subject, opening, "
        "details, request, greeting, closing, signature, disclaimer, attachment names, quoted "
        "earlier reply), with invented names, dates, amounts and reference numbers; no two "
        "files are the same.",
        "Queues share vocabulary: a billing dispute names the berth and the ship, a theft "
        "happens at the marina, a records request asks for dredging reports, a job applicant "
        "has worked in accounts. Web forms carry a topic that senders chose, often a general "
        "one and sometimes the wrong one.",
        f"Harder cases: {pct(share(labelled, lambda d: d.mixed_with is not None))} of the "
        f"labelled documents and {pct(share(inbox, lambda d: d.mixed_with is not None))} of the "
        "inbox documents raise a second matter for another queue; each belongs to the queue "
        "of its first, longer matter.",
        f"Noise: {pct(share(everything, lambda d: d.noise == 'typos'))} of the documents carry "
        "typing mistakes (swapped, dropped, doubled or neighbouring letters); "
        f"{pct(share(everything, lambda d: d.noise.startswith('ocr')))} are scanned letters or "
        "faxes with text-recognition noise (rn→m, l→1, O→0, ß→B, ー→一, ligatures, stray "
        "marks, words broken across lines with and without hyphens), "
        f"{pct(share(everything, lambda d: d.noise == 'ocr-heavy'))} of all documents heavily.",
        f"Size: {len(everything)} files, {total_bytes / 1024:.0f} KiB of UTF-8 text.",
    ]
    realism = "\n".join(textwrap.fill(b, 76, initial_indent="- ", subsequent_indent="  ")
                         for b in bullets)
    largest = max(q[1] for q in QUEUES)
    smallest = min(q[1] for q in QUEUES)
    return f"""<!-- Generated by corpora/generate.py --seed {seed}; do not edit by hand. -->
# Port Velmar demo corpus

The inbound correspondence of the **Harbour Authority of Port Velmar**, an
invented coastal port. Everything in it is made up: the port, its streets,
people, ships, yachts, companies, laws and reference numbers. Letters and
e-mails come from shipping agents, owners, customs brokers, yacht owners,
residents, journalists and job seekers, and each belongs to one of
{len(QUEUES)} queues.

**Generated files.** Every file under `labelled/` and `inbox/`, and
`inbox-key.csv`, is generated by `corpora/generate.py` with seed {seed}, as
is this README. Plain-text documents and the CSV (whose first line must be
the header `path,queue`) cannot carry a note of their own, so this page is
that note. Regenerate everything, byte for byte, with:

    corpora/generate.py --seed {seed}

## Layout

- `labelled/<queue>/NNNN.txt`: {len(labelled)} documents sorted into their queues,
  for learning (`chute learn --tree labelled/`).
- `inbox/*.txt`: {len(inbox)} other documents from the same generator, unlabelled,
  named as they would arrive (`mail-2026-11-30-0815.txt`, `scan-0042.txt`,
  `fax-…`, `webform-…`, `phone-…`).
- `inbox-key.csv`: the right queue for each inbox document (RFC 4180, header
  `path,queue`, paths relative to this folder), to measure routing.

## Queues

The intake is skewed on purpose: the largest queue has {largest / smallest:.0f} times
as many documents as the smallest, so priors matter.

| queue | labelled | inbox | what arrives there |
|---|---:|---:|---|
{chr(10).join(rows)}
| **total** | **{len(labelled)}** | **{len(inbox)}** | |

## Languages

About one document in ten is in Spanish, German or Japanese (Japanese in
ordinary Japanese script, without spaces between words). In addition,
some English documents are written by Spanish, German or Japanese senders.

| language | labelled | inbox | share of all |
|---|---:|---:|---:|
{chr(10).join(lang_rows)}

## What makes it realistic

{realism}

## Checking it

`corpora/sklearn_check.py` (needs Debian's python3-sklearn) trains
scikit-learn's multinomial naive Bayes on `labelled/` and prints its
accuracy and per-queue recall on the inbox: an outside yardstick for
chute's own figures.
"""


def main(argv):
    here = os.path.dirname(os.path.abspath(__file__))
    parser = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    parser.add_argument("--seed", type=int, default=SEED,
                        help=f"random seed (default {SEED}, the committed corpus)")
    parser.add_argument("--out", default=os.path.join(here, "port-authority"),
                        help="output folder (default corpora/port-authority)")
    args = parser.parse_args(argv)

    labelled, inbox = generate(args.seed)

    out = args.out
    for sub in ("labelled", "inbox"):
        shutil.rmtree(os.path.join(out, sub), ignore_errors=True)
    counters = {}
    for doc in labelled:
        counters[doc.queue] = counters.get(doc.queue, 0) + 1
        write_text(os.path.join(out, "labelled", doc.queue, f"{counters[doc.queue]:04d}.txt"),
                   doc.text)
    for doc in inbox:
        write_text(os.path.join(out, "inbox", doc.name), doc.text)
    buf = io.StringIO()
    writer = csv.writer(buf, lineterminator="\r\n")
    writer.writerow(["path", "queue"])
    for doc in sorted(inbox, key=lambda d: d.name):
        writer.writerow([f"inbox/{doc.name}", doc.queue])
    write_text(os.path.join(out, "inbox-key.csv"), buf.getvalue())
    write_text(os.path.join(out, "README.md"), readme(args.seed, labelled, inbox))
    print(f"wrote {len(labelled)} labelled and {len(inbox)} inbox documents to {out}")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
