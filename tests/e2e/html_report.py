#!/usr/bin/python3
"""`chute evaluate --html` in a real browser.

    html_report.py path/to/chute [--save-screenshot FILE]

1. Makes the demo store (corpora/port-authority, learned with chute's
   defaults) and writes `chute evaluate --target-accuracy 0.98 --html`.
2. Checks the page offline: it parses as XML (lxml over libxml2), loads
   nothing from elsewhere (no script, no link, no img, no src, no url()
   but the page's own #patterns), and holds the four charts.
3. Opens it in headless Chromium (Debian package chromium; as root with
   --no-sandbox) and checks that no console message is logged (a control
   page that calls console.error shows that such messages are caught) and
   that the screenshot is not blank: it has many colours, a good share of
   non-white pixels, and pixels of the Okabe-Ito blue (0, 114, 178) of the
   charts. The PNG is decoded here with zlib (PNG specification, W3C
   Recommendation, 2003, §§ 9-11: filters 0-4 on 8-bit RGB and RGBA).
4. A store whose queue name holds markup characters: the page shows the
   name escaped, never as markup.
5. The production page (`evaluate --from-log --html`) after the demo inbox
   was routed into folders with an audit sample and reviewed: well-formed,
   self-contained, no console message, not blank.

With --save-screenshot, the screenshot of the demo report is also written
to FILE (docs/report.png in the README is made this way).
"""

import os
import re
import shutil
import struct
import subprocess
import sys
import tempfile
import zlib

import lxml.etree

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))
WINDOW = (1100, 4300)
BLUE = (0, 114, 178)


def fail(message):
    sys.exit(f"FAILED: {message}")


def run(binary, *args):
    r = subprocess.run([binary, *args], capture_output=True, text=True)
    if r.returncode != 0:
        fail(f"chute {' '.join(args)} exited with {r.returncode}: "
             f"{r.stderr.strip()}")
    return r.stdout


def chromium():
    for name in ("chromium", "chromium-browser"):
        path = shutil.which(name)
        if path:
            return path
    fail("chromium is not installed (Debian package 'chromium')")


def open_in_chromium(page, screenshot, scratch):
    """Returns the console lines Chromium logs while loading page."""
    profile = tempfile.mkdtemp(prefix="profile-", dir=scratch)
    args = [chromium(), "--headless", "--no-sandbox", "--disable-gpu",
            "--disable-background-networking", "--disable-component-update",
            "--disable-sync", "--no-first-run", "--hide-scrollbars",
            f"--user-data-dir={profile}", "--enable-logging=stderr", "--v=0",
            "--force-device-scale-factor=1",
            f"--window-size={WINDOW[0]},{WINDOW[1]}",
            f"--screenshot={screenshot}", "file://" + page]
    r = subprocess.run(args, capture_output=True, text=True, timeout=180)
    if r.returncode != 0 or not os.path.exists(screenshot):
        fail(f"chromium could not take the screenshot:\n{r.stderr[-2000:]}")
    return [line for line in r.stderr.splitlines() if "CONSOLE" in line]


def decode_png(path):
    """(width, height, rows of (r, g, b) tuples) of an 8-bit RGB/RGBA PNG."""
    with open(path, "rb") as f:
        data = f.read()
    if data[:8] != b"\x89PNG\r\n\x1a\n":
        fail(f"{path} is not a PNG file")
    pos, idat, header = 8, b"", None
    while pos < len(data):
        length, kind = struct.unpack(">I4s", data[pos:pos + 8])
        body = data[pos + 8:pos + 8 + length]
        if kind == b"IHDR":
            header = struct.unpack(">IIBBBBB", body)
        elif kind == b"IDAT":
            idat += body
        pos += 12 + length
    width, height, depth, colour, _, _, interlace = header
    if depth != 8 or colour not in (2, 6) or interlace != 0:
        fail(f"{path}: PNG kind not handled (depth {depth}, colour {colour})")
    bpp = 3 if colour == 2 else 4
    raw = zlib.decompress(idat)
    stride = width * bpp
    rows, previous = [], bytearray(stride)
    for y in range(height):
        start = y * (stride + 1)
        kind, line = raw[start], bytearray(raw[start + 1:start + 1 + stride])
        for i in range(stride):
            a = line[i - bpp] if i >= bpp else 0
            b = previous[i]
            c = previous[i - bpp] if i >= bpp else 0
            if kind == 1:
                line[i] = (line[i] + a) & 0xFF
            elif kind == 2:
                line[i] = (line[i] + b) & 0xFF
            elif kind == 3:
                line[i] = (line[i] + (a + b) // 2) & 0xFF
            elif kind == 4:
                p = a + b - c
                pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
                pred = a if pa <= pb and pa <= pc else b if pb <= pc else c
                line[i] = (line[i] + pred) & 0xFF
        rows.append([tuple(line[x * bpp:x * bpp + 3]) for x in range(width)])
        previous = line
    return width, height, rows


def check_page_offline(path, failures, charts=True):
    with open(path, encoding="utf-8") as f:
        text = f.read()
    try:
        lxml.etree.fromstring(text.encode("utf-8"), lxml.etree.XMLParser())
    except lxml.etree.XMLSyntaxError as e:
        failures.append(f"{path} is not well-formed: {e}")
    for pattern, what in ((r"<script", "a script"), (r"<link", "a link"),
                          (r"<img", "an image"), (r"\ssrc=", "a src"),
                          (r"@import", "an @import"),
                          (r"url\((?!#)", "a url() outside the page"),
                          (r"https?://(?!www\.w3\.org/)", "an outside address")):
        if re.search(pattern, text):
            failures.append(f"{path} has {what}: it must be self-contained")
    for chart in ("Confusion matrix", "Precision, recall and F1",
                  "Accuracy among the documents routed automatically",
                  "Reliability diagram") if charts else ():
        if f"<title>{chart}" not in text:
            failures.append(f"{path} lacks the chart '{chart}'")
    return text


def check_production_page(binary, tmp, failures):
    """`evaluate --from-log --html` after a routed, reviewed demo inbox."""
    db = os.path.join(tmp, "production.db")
    inbox = os.path.join(tmp, "inbox")
    routed = os.path.join(tmp, "routed")
    corpus = os.path.join(ROOT, "corpora", "port-authority")
    shutil.copytree(os.path.join(corpus, "inbox"), inbox)
    run(binary, "init", "--db", db)
    run(binary, "learn", "--db", db, "--tree", os.path.join(corpus, "labelled"))
    run(binary, "route", "--db", db, inbox, "--into", routed, "--move",
        "--audit-share", "0.3", "--audit-seed", "5", "--format", "csv")
    # A reviewer files every document held for review where the answer key
    # says it belongs.
    key = {}
    with open(os.path.join(corpus, "inbox-key.csv"), encoding="utf-8") as f:
        next(f)
        for line in f:
            path, queue = line.rstrip("\n").rsplit(",", 1)
            key[os.path.basename(path)] = queue
    review = os.path.join(routed, "_review")
    for name in sorted(os.listdir(review)):
        os.makedirs(os.path.join(routed, key[name]), exist_ok=True)
        os.rename(os.path.join(review, name), os.path.join(routed, key[name], name))
    run(binary, "correct", "--db", db, "--from-folders", routed)
    page = os.path.join(tmp, "production.html")
    run(binary, "evaluate", "--db", db, "--from-log", "--html", page)
    text = check_page_offline(page, failures, charts=False)
    if "Wilson" not in text:
        failures.append(f"{page} does not name the Wilson interval")
    shot = os.path.join(tmp, "production.png")
    for line in open_in_chromium(page, shot, tmp):
        failures.append(f"console (production page): {line}")
    width, height, rows = decode_png(shot)
    colours = {px for row in rows[::2] for px in row[::2]}
    non_white = sum(px != (255, 255, 255) for row in rows[::2] for px in row[::2])
    share = non_white / (len(rows[::2]) * len(rows[0][::2]))
    if len(colours) < 20 or share < 0.01:
        failures.append(f"{shot} looks blank: {len(colours)} colours, "
                        f"{share:.1%} non-white")


def check_screenshot(path, failures):
    width, height, rows = decode_png(path)
    colours, non_white, blue = set(), 0, 0
    for row in rows[::2]:
        for px in row[::2]:
            colours.add(px)
            if px != (255, 255, 255):
                non_white += 1
            if px == BLUE:
                blue += 1
    sampled = len(rows[::2]) * len(rows[0][::2])
    share = non_white / sampled
    if len(colours) < 20 or share < 0.03 or blue < 50:
        failures.append(f"{path} looks blank: {len(colours)} colours, "
                        f"{share:.1%} non-white, {blue} chart-blue pixels")
    return f"{width}x{height}, {len(colours)} colours, {share:.1%} non-white"


def main():
    if len(sys.argv) not in (2, 4) or (len(sys.argv) == 4 and
                                       sys.argv[2] != "--save-screenshot"):
        sys.exit("usage: html_report.py path/to/chute [--save-screenshot FILE]")
    binary = os.path.abspath(sys.argv[1])
    failures = []
    with tempfile.TemporaryDirectory(prefix="chute-html-") as tmp:
        # The control: Chromium's console output is really caught.
        control = os.path.join(tmp, "control.html")
        with open(control, "w", encoding="utf-8") as f:
            f.write("<!DOCTYPE html><title>c</title>"
                    "<script>console.error('control message')</script>")
        if not any("control message" in line for line in open_in_chromium(
                control, os.path.join(tmp, "control.png"), tmp)):
            fail("chromium's console messages are not seen: the check "
                 "would prove nothing")

        db = os.path.join(tmp, "harbour.db")
        run(binary, "init", "--db", db)
        run(binary, "learn", "--db", db, "--tree",
            os.path.join(ROOT, "corpora", "port-authority", "labelled"))
        page = os.path.join(tmp, "report.html")
        run(binary, "evaluate", "--db", db, "--target-accuracy", "0.98",
            "--html", page)
        check_page_offline(page, failures)
        shot = os.path.join(tmp, "report.png")
        console = open_in_chromium(page, shot, tmp)
        for line in console:
            failures.append(f"console: {line}")
        summary = check_screenshot(shot, failures)
        if len(sys.argv) == 4:
            shutil.copyfile(shot, sys.argv[3])

        # Markup characters in a queue name are shown, not obeyed.
        name = "tricky <b>&amp; \"q\" 'x'"
        labelled = os.path.join(tmp, "l")
        for queue, words in ((name, "alpha beta gamma"),
                             ("plain", "delta epsilon zeta")):
            os.makedirs(os.path.join(labelled, queue))
            for i in range(4):
                with open(os.path.join(labelled, queue, f"{i}.txt"), "w",
                          encoding="utf-8") as f:
                    f.write(f"{words} {words.split()[i % 3]} n{i}\n")
        db2 = os.path.join(tmp, "tricky.db")
        run(binary, "init", "--db", db2)
        run(binary, "learn", "--db", db2, "--tree", labelled)
        page2 = os.path.join(tmp, "tricky.html")
        run(binary, "evaluate", "--db", db2, "--folds", "2", "--html", page2)
        text = check_page_offline(page2, failures)
        escaped = ("tricky &lt;b&gt;&amp;amp; &quot;q&quot; &#39;x&#39;")
        if name in text or "<b>" in text:
            failures.append("a queue name was written into the page as markup")
        if escaped not in text:
            failures.append("the escaped queue name is missing from the page")
        for line in open_in_chromium(page2, os.path.join(tmp, "t.png"), tmp):
            failures.append(f"console (tricky names): {line}")

        check_production_page(binary, tmp, failures)

    for message in failures:
        print("FAILED CHECK:", message)
    if failures:
        sys.exit(f"FAILED: {len(failures)} checks of the HTML report")
    print(f"HTML report: well-formed, self-contained, no console message in "
          f"Chromium; screenshot {summary}; queue names escaped; the "
          f"production page (evaluate --from-log) likewise")


if __name__ == "__main__":
    main()
