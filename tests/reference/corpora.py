"""The two outside corpora of the cross-validation checks, read from Debian.

Reuters-21578 'acq' and 'crude': David D. Lewis, "Reuters-21578 text
categorization test collection", Distribution 1.0 (1997). Debian's package
r-cran-tm (the R text-mining package tm, Feinerer, Hornik & Meyer, "Text
Mining Infrastructure in R", Journal of Statistical Software 25(5), 2008;
citation recalled from memory)
ships 50 'acq' and 20 'crude' documents of it as one XML file each under
/usr/lib/R/site-library/tm/texts/{acq,crude}/. The files carry their labels
in markup (<TOPICS>, <PLACES>, ...), so only the <TITLE> and <BODY> of
<TEXT> are read, with libxml2 through its Python binding lxml (Debian
python3-lxml).

The Linux man-pages project (https://www.kernel.org/doc/man-pages/),
release 6.03 in Debian's packages manpages and manpages-dev: the pages of
sections 2 (system calls), 3 (library functions), 4 (special files),
5 (file formats) and 7 (overviews), one queue per section. Pages are
rendered to plain text with groff (Debian groff-base); the running header
and footer lines, which name the section ("System Calls Manual", "open(2)"),
are removed so that the label is not handed to the classifier. Pages that
only include another page (a ".so" request; Debian's packaging turns most
of them into symbolic links) are left out.
"""

import concurrent.futures
import gzip
import hashlib
import os
import subprocess

import lxml.etree

REUTERS_ROOT = "/usr/lib/R/site-library/tm/texts"
REUTERS_QUEUES = ("acq", "crude")
MAN_ROOT = "/usr/share/man"
MAN_SECTIONS = ("man2", "man3", "man4", "man5", "man7")
MAN_PACKAGES = ("manpages", "manpages-dev")

# How a page is rendered: tbl for tables, preconv for the input encoding,
# the man macros, UTF-8 text, no hyphenation (HY=0, so words are not split
# across lines); grotty -c -b -u: no SGR escapes and no overstriking for
# bold or underline, so the output is plain text (groff(1), grotty(1),
# groff_man(7)).
GROFF_COMMAND = ["groff", "-k", "-t", "-man", "-rHY=0", "-Tutf8", "-P-c",
                 "-P-b", "-P-u"]
# Bumped whenever rendering changes, so that old cache entries are not used.
RENDER_VERSION = "1: groff text, running header and footer removed"


class CorpusError(Exception):
    """A corpus file is missing or unreadable."""


# --- Reuters-21578 ---------------------------------------------------------

def list_reuters():
    """[(relative path, queue)] of every 'acq' and 'crude' file, sorted."""
    docs = []
    for queue in REUTERS_QUEUES:
        folder = os.path.join(REUTERS_ROOT, queue)
        if not os.path.isdir(folder):
            raise CorpusError(f"{folder} is missing: install Debian's "
                              "r-cran-tm package")
        for name in sorted(os.listdir(folder)):
            if name.endswith(".xml"):
                docs.append((f"{queue}/{name}", queue))
    return docs


def reuters_text(relative_path):
    """The <TITLE> and <BODY> text of one Reuters-21578 XML file."""
    path = os.path.join(REUTERS_ROOT, relative_path)
    if not os.path.isfile(path):
        raise CorpusError(f"{path} is listed in the folds file but missing "
                          "on this machine: install Debian's r-cran-tm "
                          "package (the folds were made from 0.7-11)")
    try:
        root = lxml.etree.parse(path).getroot()
    except (OSError, lxml.etree.XMLSyntaxError) as e:
        raise CorpusError(f"{path}: {e}") from e
    parts = []
    for tag in ("TITLE", "BODY"):
        for element in root.iterfind(f"TEXT/{tag}"):
            parts.append("".join(element.itertext()))
    if not parts:
        raise CorpusError(f"{path}: no <TITLE> or <BODY> in <TEXT>")
    return "\n\n".join(parts) + "\n"


# --- man-pages ---------------------------------------------------------------

def include_only(path):
    """True when a page source only includes another page (.so)."""
    if os.path.islink(path):
        return True
    with gzip.open(path, "rt", encoding="utf-8", errors="replace") as f:
        requests = [line for line in f
                    if line.strip() and not line.startswith(('.\\"', "'\\\""))]
    return bool(requests) and all(r.startswith(".so ") for r in requests)


def list_manpages():
    """[(relative path, queue)] of the man-pages pages of MAN_SECTIONS."""
    try:
        listing = subprocess.run(
            ["dpkg-query", "-L", *MAN_PACKAGES], check=True,
            capture_output=True, text=True).stdout.split("\n")
    except (OSError, subprocess.CalledProcessError) as e:
        raise CorpusError("cannot list Debian's manpages and manpages-dev "
                          f"packages: {e}") from e
    docs = []
    for path in sorted(set(listing)):
        folder, name = os.path.split(path)
        section = os.path.basename(folder)
        if (os.path.dirname(folder) != MAN_ROOT or section not in MAN_SECTIONS
                or not name.endswith(".gz")):
            continue
        if include_only(path):
            continue
        docs.append((f"{section}/{name}", section))
    return docs


def _render_one(source, target):
    with gzip.open(source, "rb") as f:
        page = f.read()
    env = dict(os.environ, LC_ALL="C.UTF-8")
    result = subprocess.run(GROFF_COMMAND, input=page, capture_output=True,
                            env=env)
    if result.returncode != 0:
        raise CorpusError(f"groff failed on {source}: "
                          f"{result.stderr.decode(errors='replace')[:200]}")
    lines = result.stdout.decode("utf-8").split("\n")
    # Drop the running header (first non-blank line) and footer (last).
    text_lines = [i for i, line in enumerate(lines) if line.strip()]
    if len(text_lines) < 3:
        raise CorpusError(f"groff rendered {source} to almost nothing")
    del lines[text_lines[-1]]
    del lines[text_lines[0]]
    text = "\n".join(lines).strip("\n") + "\n"
    temporary = target + ".part"
    with open(temporary, "w", encoding="utf-8") as f:
        f.write(text)
    os.replace(temporary, target)


def render_manpages(relative_paths, cache_root, jobs=2):
    """Renders pages to text files under cache_root; returns
    ({relative path: text file}, number of pages rendered now).

    A page is rendered again only when its text file is missing or older
    than the page source, or when RENDER_VERSION or the groff command
    changes (they name the cache folder).
    """
    key = hashlib.sha256(
        (RENDER_VERSION + "\0" + " ".join(GROFF_COMMAND)).encode()
    ).hexdigest()[:12]
    cache = os.path.join(cache_root, f"manpages-{key}")
    targets, work = {}, []
    for rel in relative_paths:
        source = os.path.join(MAN_ROOT, rel)
        if not os.path.isfile(source):
            raise CorpusError(f"{source} is listed in the folds file but "
                              "missing on this machine: install Debian's "
                              "manpages and manpages-dev packages (the folds "
                              "were made from release 6.03)")
        target = os.path.join(cache, rel[:-len(".gz")] + ".txt")
        targets[rel] = target
        if (not os.path.exists(target)
                or os.path.getmtime(target) < os.path.getmtime(source)):
            os.makedirs(os.path.dirname(target), exist_ok=True)
            work.append((source, target))
    with concurrent.futures.ThreadPoolExecutor(max_workers=jobs) as pool:
        for future in [pool.submit(_render_one, s, t) for s, t in work]:
            future.result()
    return targets, len(work)
