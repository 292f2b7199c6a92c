"""Class sets, ``kitgen batch`` (#12), against outside readers of its output.

One set of thirteen entries: four in a ``kits:`` list and nine roster
rows; twelve kits are good (English, Spanish and Russian; north, south and
the equator; one kit in two copies; a roster column left empty in every
row), and one roster row has a latitude of 91.  It is built twice through
``python3 -m kitgen batch`` (as a user or the web page runs it), with one
worker and with two, and each good kit is built again alone by
``kitgen build`` from its merged recipe, written out here.
The kits are small (80 mm, six stars) so the file runs in seconds.

References: pypdf (an independent PDF reader) for pages, page sizes and
text; Python's csv module (RFC 4180) for the manifest; the template files
themselves, read with PyYAML, for every expected word.
"""

from __future__ import annotations

import csv
import os
import re
import subprocess
import sys
from importlib import resources
from pathlib import Path

import pytest
import yaml
from pypdf import PdfReader

from kitgen.batch.naming import kit_file_names, kit_stem
from kitgen.batch.shares import plate_moves, worker_shares
from kitgen.batch.setfile import load_set
from kitgen.batch.work import KitJob
from kitgen.batch.setfile import SetKit
from kitgen.cli import main
from kitgen.errors import Message

DEFAULTS = {"latitude": 52.2, "epoch": 2027, "diameter_mm": 80, "stars": {"brightest": 6},
            "title": "Fernhollow Science Club"}
LISTED = [
    {"owner": "Mira Quellstone", "copies": 2},
    {"owner": "Tavi Renwick", "latitude": -33.9, "language": "es"},
    {"owner": "Оскар Линдквар", "latitude": "55 45 N", "language": "ru"},
    {"title": "Equator Field Station", "latitude": 0.5},
]
ROSTER_HEADER = "owner,latitude,language,place,copies"
#: (owner, latitude, language) of each roster row; the place column is
#: empty in every row, and so is copies.
ROSTER = [
    ("Ana Beltrán", "-12.05", "es"), ("Pavel Drozdin", "59.9", "ru"), ("Lena Okonkwo-Fry", "", ""),
    ("Sami Haddou", "-26.2", ""), ("Rhea Vantongeren", "40.4", "es"), ("Dmitri Solev", "-34.6", "ru"),
    ("Juno Abernethy", "64.1", "en"), ("Tomasz/Wren", "35.7", ""), ("Bad Row", "91", ""),
]
BAD_KIT, BAD_LINE = 13, 10   # the ninth roster row is line 10 of the file (the header is line 1)
#: The print files' stocks, in the order a coordinator loads the printer.
STOCKS = ("paper", "card", "film")


def _template(code: str) -> dict:
    return yaml.safe_load(resources.files("kitgen.templates").joinpath(f"{code}.yaml").read_text("utf-8"))


def _expected_kits() -> list[dict]:
    """Each entry's merged recipe, worked out here: the defaults, then the
    entry's own keys (roster cells only where not empty)."""
    out = []
    for item in LISTED:
        out.append({**DEFAULTS, **{k: v for k, v in item.items() if k != "copies"}})
    for owner, lat, lang in ROSTER:
        row = {"owner": owner}
        if lat:
            row["latitude"] = lat
        if lang:
            row["language"] = lang
        out.append({**DEFAULTS, **row})
    return out


def _copies(number: int) -> int:
    return LISTED[number - 1].get("copies", 1) if number <= len(LISTED) else 1


@pytest.fixture(scope="module")
def class_set(tmp_path_factory):
    root = tmp_path_factory.mktemp("class-set")
    (root / "set.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": LISTED, "roster": "pupils.csv"},
                                                  allow_unicode=True, sort_keys=False), encoding="utf-8")
    lines = [ROSTER_HEADER] + [f"{o},{lat},{lang},," for o, lat, lang in ROSTER]
    (root / "pupils.csv").write_text("\n".join(lines) + "\n", encoding="utf-8")
    return root


def _kitgen(*args, timeout=600):
    """``python3 -m kitgen ARGS`` in a fresh process, as a user (or the web
    page) runs it; every build compared here is a process of its own, so
    no test's leftovers in this one can touch the bytes."""
    env = dict(os.environ, PYTHONPATH=str(Path(__file__).resolve().parents[1]))
    return subprocess.run([sys.executable, "-m", "kitgen", *map(str, args)], capture_output=True, text=True,
                          env=env, timeout=timeout)


@pytest.fixture(scope="module")
def one_worker(class_set):
    done = _kitgen("batch", class_set / "set.yaml", "-o", class_set / "out-1", "--jobs", "1", "--quiet")
    return done.returncode, class_set / "out-1"


@pytest.fixture(scope="module")
def two_workers(class_set):
    return _kitgen("batch", class_set / "set.yaml", "-o", class_set / "out-2", "--jobs", "2"), class_set / "out-2"


def _manifest(folder: Path) -> list[dict]:
    # Reference: Python's csv module, RFC 4180.
    with open(folder / "manifest.csv", newline="", encoding="utf-8-sig") as fh:
        return list(csv.DictReader(fh))


def _stocks(pdf: Path, language: str) -> list[str]:
    """The stock each page of a kit says it goes on: the template's own
    ``page.on_film`` and ``page.on_card`` words, found by pypdf's text
    extraction, and plain paper for a page that says neither (the
    instructions, which the kit's printing steps put on plain paper)."""
    said = _template(language)["page"]
    return ["film" if said["on_film"] in text else "card" if said["on_card"] in text else "paper"
            for text in (page.extract_text() for page in PdfReader(pdf).pages)]


def test_manifest_rows_match_the_kits(one_worker):
    status, out = one_worker
    rows = _manifest(out)
    expected = _expected_kits()
    assert [int(r["kit"]) for r in rows] == list(range(1, len(expected) + 1))
    for row, kit in zip(rows, expected):
        n = int(row["kit"])
        assert row["owner"] == kit.get("owner", "")
        assert row["title"] == kit["title"]
        assert int(row["copies"]) == _copies(n)
        if n == BAD_KIT:
            continue
        assert row["status"] == "ok"
        assert row["language"] == kit.get("language", "en")
        lat = kit["latitude"]
        assert float(row["latitude"]) == pytest.approx(55.75 if lat == "55 45 N" else float(lat), abs=1e-9)
        pdf = out / row["file"]
        pages = PdfReader(pdf).pages   # Reference: pypdf
        stocks = _stocks(pdf, row["language"])
        assert int(row["pages"]) == len(pages)
        assert int(row["film_pages"]) == stocks.count("film") >= 1
        assert int(row["card_pages"]) == stocks.count("card") >= 1
        assert int(row["paper_pages"]) == stocks.count("paper") >= 1
        assert stocks.index("card") == stocks.count("paper")   # the instructions come first


def test_a_bad_row_is_named_and_the_others_are_built(one_worker, two_workers):
    status, out = one_worker
    assert status == 2
    bad = _manifest(out)[BAD_KIT - 1]
    assert bad["file"] == "" and bad["pages"] == ""
    assert f"row {BAD_LINE}" in bad["status"] and "'latitude'" in bad["status"] and "91" in bad["status"]
    assert len(list((out / "kits").iterdir())) == BAD_KIT - 1
    done, _ = two_workers
    assert done.returncode == 2
    failed = [line for line in done.stderr.splitlines() if f"kit {BAD_KIT} not built" in line]
    assert len(failed) == 1 and f"pupils.csv, row {BAD_LINE}: 'latitude'" in failed[0]
    assert "Traceback" not in done.stderr
    summary = Message("errors.batch_summary", built=BAD_KIT - 1, total=BAD_KIT, failed=1, folder=out.parent / "out-2")
    assert done.stderr.splitlines()[-1] == summary.text()


def test_each_kit_equals_a_single_build_byte_for_byte(one_worker, tmp_path):
    from concurrent.futures import ThreadPoolExecutor

    status, out = one_worker
    built = [(row, kit) for row, kit in zip(_manifest(out), _expected_kits()) if row["status"] == "ok"]
    for row, kit in built:
        (tmp_path / f"kit-{row['kit']}.yaml").write_text(yaml.safe_dump(kit, allow_unicode=True), encoding="utf-8")
    with ThreadPoolExecutor(2) as pool:   # two `kitgen build` processes at a time
        done = list(pool.map(lambda r: _kitgen("build", tmp_path / f"kit-{r['kit']}.yaml", "-o",
                                               tmp_path / f"kit-{r['kit']}.pdf"), [row for row, _ in built]))
    assert [d.returncode for d in done] == [0] * len(built)
    for row, _ in built:
        # Reference: `kitgen build` of the same merged recipe, a process of its own.
        assert (out / row["file"]).read_bytes() == (tmp_path / f"kit-{row['kit']}.pdf").read_bytes(), row["file"]


def test_print_files_hold_every_kits_pages_in_order(one_worker):
    status, out = one_worker
    rows = [r for r in _manifest(out) if r["status"] == "ok"]
    printed = {m: PdfReader(out / f"print-{m}.pdf").pages for m in STOCKS}   # Reference: pypdf
    at = {m: 0 for m in STOCKS}
    for material in STOCKS:
        for row in rows:
            kit_pages = PdfReader(out / row["file"]).pages
            stocks = _stocks(out / row["file"], row["language"])
            chosen = [p for p, s in zip(kit_pages, stocks) if s == material]
            words = _template(row["language"])
            name = row["owner"] or row["title"]
            stamp = words["batch"]["stamp"].format(number=row["kit"], name=name)
            spans = []
            for _ in range(int(row["copies"])):
                first = at[material] + 1
                for page in chosen:
                    got = printed[material][at[material]]
                    at[material] += 1
                    assert [float(v) for v in got.mediabox] == [float(v) for v in page.mediabox]
                    assert page.get_contents().get_data() in got.get_contents().get_data()
                    assert stamp in got.extract_text()
                # one page as its number, else first and last with an en dash
                spans.append(str(first) if first == at[material] else f"{first}\u2013{at[material]}")
            assert row[f"{material}_print_pages"] == " ".join(spans)
    assert at == {m: len(printed[m]) for m in at}


def test_a_school_listed_apart_shares_its_pages_in_the_print_files(one_worker):
    # Mira (a kits entry on the defaults) and Lena (the roster's third row,
    # its cells empty) are of one school, with kits of five other schools
    # between them: their first card pages hold the same shared content
    # streams, each in the file once (the same indirect objects, pypdf)
    _, out = one_worker
    rows = {r["owner"]: r for r in _manifest(out)}
    card = PdfReader(out / "print-card.pdf")
    pages = [card.pages[int(re.match(r"\d+", rows[name]["card_print_pages"]).group()) - 1] for name in
             ("Mira Quellstone", "Lena Okonkwo-Fry")]
    numbers = [int(rows[name]["kit"]) for name in ("Mira Quellstone", "Lena Okonkwo-Fry")]
    assert numbers[1] - numbers[0] > 5
    inner = [[o.idnum for o in p["/Contents"]][1:-1] for p in pages]   # within the stamp's q ... Q wrap
    assert inner[0] and inner[0] == inner[1]


def test_one_and_two_workers_give_the_same_bytes(class_set, one_worker, two_workers):
    _, one = one_worker
    done, two = two_workers
    _same_files(one, two)
    for name in ("print-paper.pdf", "print-card.pdf", "print-film.pdf"):
        assert "/ID" not in PdfReader(one / name).trailer   # no random file identifier (pypdf)


def _same_files(one: Path, two: Path) -> None:
    names = sorted(p.relative_to(one) for p in one.rglob("*") if p.is_file())
    assert names == sorted(p.relative_to(two) for p in two.rglob("*") if p.is_file())
    for name in names:
        assert (one / name).read_bytes() == (two / name).read_bytes(), name


def test_plates_drawn_by_the_other_worker_give_the_same_bytes(tmp_path):
    # three schools of one pupil each on two workers: one worker draws a
    # plate for the other's second school (kitgen.batch.shares.plate_moves);
    # every file is the same as one worker's, byte for byte
    kits = [{"owner": "Ida Brookmere", "latitude": 51.5}, {"owner": "Olu Stanway", "latitude": -33.9},
            {"owner": "Pia Harrowgate", "latitude": 0.5}]
    (tmp_path / "set.yaml").write_text(yaml.safe_dump({"defaults": {"epoch": 2027}, "kits": kits}), encoding="utf-8")
    jobs = [KitJob(k.number, k.recipe) for k in load_set(tmp_path / "set.yaml").kits]
    assert plate_moves(worker_shares(jobs, 2))
    for jobs_arg in ("1", "2"):
        done = _kitgen("batch", tmp_path / "set.yaml", "-o", tmp_path / f"out-{jobs_arg}", "--jobs", jobs_arg, "--quiet")
        assert done.returncode == 0, done.stderr
    _same_files(tmp_path / "out-1", tmp_path / "out-2")


def test_progress_lines_when_not_a_terminal(two_workers):
    done, out = two_workers
    pattern = re.escape(_template("en")["errors"]["batch_progress"])
    pattern = pattern.replace(r"\{done\}", r"(\d+)").replace(r"\{total\}", r"(\d+)")
    pattern = pattern.replace(r"\{rate\}", r"[\d.]+").replace(r"\{left\}", r"\d+")
    progress = [re.fullmatch(pattern, line) for line in done.stderr.splitlines()]
    progress = [m for m in progress if m]
    assert progress and progress[-1].groups() == (str(BAD_KIT), str(BAD_KIT))
    assert done.stdout.strip() == str(out)


def test_quiet_says_nothing_and_a_rerun_replaces_the_folder(tmp_path):
    (tmp_path / "two.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": [{"owner": "Ivo"},
                                                                                      {"owner": "Uma"}]}))
    out = tmp_path / "out"
    for _ in range(2):   # the second run replaces the first one's folder whole
        done = _kitgen("batch", tmp_path / "two.yaml", "-o", out, "--quiet", "--jobs", "1")
        assert (done.returncode, done.stderr) == (0, "")
    assert sorted(p.name for p in (out / "kits").iterdir()) == ["001-Ivo.pdf", "002-Uma.pdf"]
    assert not [p for p in tmp_path.iterdir() if p.name.startswith(".")]   # no temporary folder left


def test_a_folder_of_the_users_is_never_replaced(tmp_path, capsys):
    (tmp_path / "one.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": [{"owner": "Ivo"}]}))
    mine = tmp_path / "mine"
    mine.mkdir()
    (mine / "notes.txt").write_text("keep me")
    assert main(["batch", str(tmp_path / "one.yaml"), "-o", str(mine), "--quiet"]) == 2
    assert (mine / "notes.txt").read_text() == "keep me"
    assert len(capsys.readouterr().err.strip().splitlines()) == 1


@pytest.mark.parametrize("language", ["ru", "fr"])
def test_a_folder_refused_is_said_in_the_sets_language(tmp_path, capsys, language):
    """The refusal of a folder of the user's is said in the set's
    language, as the set's summary and its kits' reasons are: the
    template's own wording (a Russian set's coordinator had it in
    English)."""
    (tmp_path / "one.yaml").write_text(yaml.safe_dump({"defaults": {**DEFAULTS, "language": language},
                                                       "kits": [{"owner": "Ivo"}]}))
    mine = tmp_path / "mine"
    mine.mkdir()
    (mine / "notes.txt").write_text("keep me")
    assert main(["batch", str(tmp_path / "one.yaml"), "-o", str(mine), "--quiet"]) == 2
    (line,) = capsys.readouterr().err.strip().splitlines()
    wording = _template(language)["errors"]["batch_folder_foreign"].split("{path}")[1].split("({names})")[0]
    assert wording.strip(" :") and wording.strip(" :") in line


def test_a_set_whose_every_kit_is_refused_says_so_kit_by_kit(tmp_path, capsys):
    """Every kit refused (here its copies): each kit's line and the
    summary, exit status 2, the manifest's rows saying why; never an
    internal fault for want of a kit to build (a malformed-sets sweep)."""
    (tmp_path / "s.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": [{"owner": "A", "copies": 0}]}))
    # Not quiet: no progress line either, where nothing is built (it had
    # said "1 of 1 kits done, 5000 kits/s").
    assert main(["batch", str(tmp_path / "s.yaml"), "-o", str(tmp_path / "out"), "--jobs", "1"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 2 and "copies" in err[0] and "internal" not in " ".join(err)
    with open(tmp_path / "out" / "manifest.csv", newline="", encoding="utf-8-sig") as fh:
        (row,) = list(csv.DictReader(fh))
    assert row["status"] != "ok" and "copies" in row["status"]


@pytest.mark.parametrize("defaults_text, line, words", [
    ("  latitude: 40\n  plates: [30, 50]\n", 3, "not both"),
    ("  latitude: 40\n  diameter_mm: 5\n", 3, "'diameter_mm' is 5"),
    ("  latitud: 40\n", 2, "'latitud'"),
])
def test_a_mistake_in_the_defaults_is_said_once_with_its_line(tmp_path, capsys, defaults_text, line, words):
    """A key of ``defaults:`` that no recipe could take is the set's own
    mistake: one line naming its line in the set file (counted here from
    the text written), and nothing built, where each of forty kits had
    said it as its own mistake, on its own line."""
    (tmp_path / "s.yaml").write_text("defaults:\n" + defaults_text + "kits:\n  - owner: A\n  - owner: B\n",
                                     encoding="utf-8")
    assert main(["batch", str(tmp_path / "s.yaml"), "-o", str(tmp_path / "out"), "--jobs", "1"]) == 2
    (err,) = capsys.readouterr().err.strip().splitlines()
    assert err.startswith(f"kitgen: error: {tmp_path / 's.yaml'}, line {line}: ") and words in err
    assert not (tmp_path / "out").exists()


@pytest.mark.parametrize("out_name, roster", [("c" * 300, None), ("out", "a\0b.csv")])
def test_impossible_names_are_one_line_and_write_nothing(tmp_path, capsys, out_name, roster):
    """An output folder's name longer than a file system takes (255 bytes,
    POSIX NAME_MAX on Linux) and a roster name with a NUL (no file system
    has one) are refused in one line, before anything is written."""
    tree = {"defaults": DEFAULTS, **({"roster": roster} if roster else {"kits": [{"owner": "A"}]})}
    (tmp_path / "s.yaml").write_text(yaml.safe_dump(tree))
    assert main(["batch", str(tmp_path / "s.yaml"), "-o", str(tmp_path / out_name), "--jobs", "1"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    assert len(err) == 1 and err[0].startswith("kitgen: error: ")
    assert sorted(p.name for p in tmp_path.iterdir()) == ["s.yaml"]


def test_an_output_folder_named_by_a_link_is_made_where_it_points(tmp_path):
    """``-o`` names a symbolic link to a folder: the set is made fresh in
    the folder it points to, the link stays, and nothing is left beside
    them, run after run."""
    (tmp_path / "s.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": [{"owner": "Ivo"}]}))
    (tmp_path / "real").mkdir()
    (tmp_path / "out").symlink_to(tmp_path / "real")
    for _ in range(2):
        assert main(["batch", str(tmp_path / "s.yaml"), "-o", str(tmp_path / "out"), "--quiet", "--jobs", "1"]) == 0
    assert (tmp_path / "out").is_symlink() and (tmp_path / "out" / "kits" / "001-Ivo.pdf").is_file()
    assert sorted(p.name for p in tmp_path.iterdir()) == ["out", "real", "s.yaml"]


def test_a_kits_internal_fault_is_one_line_or_its_traceback_with_debug(tmp_path, capsys, monkeypatch):
    """A fault of kitgen's own in one kit: the others are built, the kit's
    line names the program once, as every line of kitgen's does (the
    English template's own words, PyYAML), and ``--debug`` adds the
    kit's traceback (Python's own "Traceback (most recent call last)"),
    as the line itself says to ask for it."""
    import kitgen.batch.work as work

    real = work._kit_pdf

    def faulty(recipe):
        if recipe.owner == "Uma":
            raise ZeroDivisionError("float division by zero")
        return real(recipe)

    monkeypatch.setattr(work, "_kit_pdf", faulty)
    (tmp_path / "two.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": [{"owner": "Ivo"},
                                                                                      {"owner": "Uma"}]}))
    internal = _template("en")["errors"]["internal"].split("{kind}")[0]   # "kitgen: internal error: "
    for debug in ([], ["--debug"]):
        out = tmp_path / f"out{len(debug)}"
        assert main(["batch", str(tmp_path / "two.yaml"), "-o", str(out), "--quiet", "--jobs", "1", *debug]) == 1
        err = capsys.readouterr().err
        line = next(x for x in err.splitlines() if "ZeroDivisionError" in x)
        assert line.startswith("kitgen: ") and line.count("kitgen") == 1
        assert internal.removeprefix("kitgen: ") in line
        assert ("Traceback (most recent call last)" in err) == bool(debug)
        assert sorted(x.name for x in (out / "kits").iterdir()) == ["001-Ivo.pdf"]


@pytest.mark.parametrize("text, key", [
    ("defaults: {latitude: 10}\nkits: [{owner: A}]\nwallpaper: 1\n", "errors.set_unknown_key"),
    ("defaults: {latitude: 10}\n", "errors.set_no_kits"),
    ("kits: {owner: A}\n", "errors.set_kits_not_list"),
    ("defaults: {latitude: 10}\nroster: missing.csv\n", "errors.no_such_file"),
])
def test_a_bad_set_is_one_line_and_writes_nothing(tmp_path, capsys, text, key):
    (tmp_path / "set.yaml").write_text(text)
    assert main(["batch", str(tmp_path / "set.yaml"), "-o", str(tmp_path / "out")]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    # Reference: the English template's own words for the entry.
    words = [w for w in re.split(r"\{[a-z]+\}", _template("en")["errors"][key.split(".")[1]]) if len(w) > 3]
    assert len(err) == 1 and err[0].startswith("kitgen: error: ")
    assert all(w.strip() in err[0] for w in words)
    assert not (tmp_path / "out").exists()


def test_bad_roster_cells_name_their_row_and_key(tmp_path):
    from kitgen.batch.setfile import load_set

    (tmp_path / "set.yaml").write_text("defaults: {latitude: 10}\nroster: r.csv\n")
    (tmp_path / "r.csv").write_text("owner,diameter_mm,copies\nA,1000,\nB,,0\nC,90\n")
    kits = load_set(tmp_path / "set.yaml").kits
    assert [k.error is not None for k in kits] == [True, True, True]
    assert "row 2: 'diameter_mm'" in str(kits[0].error)
    assert "row 3: 'copies'" in str(kits[1].error)
    assert "row 4:" in str(kits[2].error)


def test_file_names_keep_the_letters_and_are_safe():
    # The characters Windows reserves in names, from Microsoft's "Naming
    # Files, Paths, and Namespaces" (quoted from memory): < > : " / \ | ? *
    assert kit_stem("Ana/Beltrán: ..\\x?") == "Ana-Beltrán-..-x"
    assert kit_stem("../..") == ""
    assert kit_stem("Оскар\u202eЛ") == "Оскар-Л"
    # a name longer than the stem's 100 bytes is cut at the end of a word
    long = "Maximilian Alexander Konstantin von Thornwick-Ridge " * 3
    stem = kit_stem(long)
    assert len(stem.encode("utf-8")) <= 100 and long.replace(" ", "-").startswith(stem + "-")
    assert kit_stem("Святослав Кондратьевич " * 6).endswith("Кондратьевич")
    kits = [SetKit(n, Message("errors.none"), tree, 1) for n, tree in
            enumerate([{"owner": "CON"}, {"title": "ab"}, {"owner": "AB"}, {}], start=1)]
    assert kit_file_names(kits) == ["001-CON.pdf", "002-ab.pdf", "003-AB.pdf", "004.pdf"]


def test_a_latitude_written_with_colons_reads_as_in_a_recipe(tmp_path):
    # YAML 1.1 reads a plain 40:26:46 as a base-60 integer (the YAML 1.1
    # int type's "sexagesimal" form); a set keeps it as written, as a
    # single recipe does.  Reference: the recipe loader on the same line.
    from kitgen.batch.setfile import load_set
    from kitgen.recipe.load import load_recipe

    (tmp_path / "set.yaml").write_text("defaults: {epoch: 2027, latitude: 40:26:46}\n"
                                       "kits:\n  - {owner: A}\n  - {owner: B, latitude: -33:52:00}\n")
    (tmp_path / "north.yaml").write_text("epoch: 2027\nlatitude: 40:26:46\n")
    (tmp_path / "south.yaml").write_text("epoch: 2027\nlatitude: -33:52:00\n")
    kits = load_set(tmp_path / "set.yaml").kits
    assert kits[0].recipe.latitude_deg == load_recipe(tmp_path / "north.yaml").latitude_deg
    assert kits[1].recipe.latitude_deg == load_recipe(tmp_path / "south.yaml").latitude_deg


def test_print_files_pass_the_checks_of_single_kits(one_worker):
    """As tests/test_pdf_validity.py checks every PDF kitgen writes: pypdf
    in strict mode reads every page, and qpdf --check finds no syntax or
    stream error (skipped, saying so, where qpdf is not installed)."""
    import shutil

    _, out = one_worker
    for name in ("print-card.pdf", "print-film.pdf"):
        reader = PdfReader(out / name, strict=True)   # Reference: pypdf, strict
        for page in reader.pages:
            page.extract_text()
    if shutil.which("qpdf") is None:
        pytest.skip("qpdf is not installed (.ci/run installs it)")
    for name in ("print-card.pdf", "print-film.pdf"):
        done = subprocess.run(["qpdf", "--check", str(out / name)], capture_output=True, text=True)
        assert done.returncode == 0, done.stdout + done.stderr   # Reference: qpdf


def test_a_terminal_gets_a_progress_bar():
    # Reference: tqdm's own bar format, "n/total [elapsed<left, rate]".
    import io

    from kitgen.batch.progress import progress

    class Terminal(io.StringIO):
        def isatty(self):
            return True

    stream = Terminal()
    bar = progress(3, stream=stream)
    for _ in range(3):
        bar.advance()
    bar.close()
    shown = stream.getvalue()
    assert "3/3" in shown and "kit/s" in shown
    assert re.search(r"\[\d\d:\d\d<\d\d:\d\d", shown)   # elapsed < time left
    quiet = Terminal()
    progress(3, quiet=True, stream=quiet).advance()
    assert quiet.getvalue() == ""


@pytest.mark.parametrize("jobs", ["0", "999", "two"])
def test_a_bad_jobs_count_is_one_line(tmp_path, capsys, jobs):
    (tmp_path / "one.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": [{"owner": "Ivo"}]}))
    try:
        status = main(["batch", str(tmp_path / "one.yaml"), "-o", str(tmp_path / "out"), "--jobs", jobs])
    except SystemExit as exc:   # argparse's own refusal of a value that is no number
        status = exc.code
    err = capsys.readouterr().err.strip().splitlines()
    assert status == 2 and len(err) == 1 and err[0].startswith("kitgen: error: ") and "--jobs" in err[0]
    assert not (tmp_path / "out").exists()


def test_a_killed_runs_leftovers_go_and_nothing_else(tmp_path):
    """What a run killed with SIGKILL leaves (a temporary folder named as
    kitgen names them, older than outfile.STALE_SECONDS) is removed by the
    next run into the same folder when it holds only a set's files; a
    temporary-looking folder holding anything else stays (common practice:
    never delete what one cannot recognise as one's own)."""
    import time as _time

    from kitgen.outfile import STALE_SECONDS

    (tmp_path / "one.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": [{"owner": "Ivo"}]}))
    old = _time.time() - STALE_SECONDS - 60
    ours, theirs = tmp_path / ".out.abc123.kitgen.dir", tmp_path / ".out.xyz789.kitgen.dir"
    (ours / "kits").mkdir(parents=True)
    (ours / "manifest.csv").write_text("kit,owner,title\n")
    theirs.mkdir()
    (theirs / "notes.txt").write_text("keep me")
    for folder in (ours, theirs):
        os.utime(folder, (old, old))
    assert main(["batch", str(tmp_path / "one.yaml"), "-o", str(tmp_path / "out"), "--quiet", "--jobs", "1"]) == 0
    assert not ours.exists() and (theirs / "notes.txt").read_text() == "keep me"


def test_print_files_have_no_file_identifier(one_worker):
    """The print files carry no file identifier (ISO 32000-1:2008, 14.4:
    /ID in the trailer), which writers draw at random: their bytes depend
    on the kits alone.  Reference: pypdf's reading of the trailer."""
    status, out = one_worker
    for material in ("card", "film"):
        trailer = PdfReader(out / f"print-{material}.pdf").trailer
        assert "/ID" not in trailer and trailer["/Info"]["/Creator"] == "kitgen"


def test_manifest_text_is_never_a_spreadsheet_formula():
    # Reference: OWASP, "CSV Injection": cells starting with = + - @ (or a
    # tab or carriage return) are run as formulas by spreadsheet programs.
    from kitgen.batch.manifest import COLUMNS, manifest_csv

    row = {c: "" for c in COLUMNS}
    row.update(kit=1, owner="=HYPERLINK(\"http://x\")", title="@SUM(A1)", place="+1", latitude="-33.9", status="ok")
    got = next(csv.DictReader(manifest_csv([row]).decode("utf-8-sig").splitlines()))
    assert (got["owner"], got["title"], got["place"]) == ("'=HYPERLINK(\"http://x\")", "'@SUM(A1)", "'+1")
    assert got["latitude"] == "-33.9"   # a number stays a number


@pytest.mark.parametrize("sep", [",", ";", "\t"])
def test_a_roster_separated_as_spreadsheets_save_it(tmp_path, sep):
    # Common practice: spreadsheets save "CSV" with semicolons (or tabs)
    # where the comma is the decimal sign.
    from kitgen.batch.setfile import load_set

    (tmp_path / "set.yaml").write_text("defaults: {latitude: 10, epoch: 2027}\nroster: r.csv\n")
    lines = ["owner", "latitude"], ["Ana, B.", "-12.5"], ["Ivo", ""]
    (tmp_path / "r.csv").write_text("\n".join(sep.join(f'"{c}"' if sep in c or "," in c else c for c in row)
                                              for row in lines) + "\n", encoding="utf-8")
    kits = load_set(tmp_path / "set.yaml").kits
    assert [(k.recipe.owner, k.recipe.latitude_deg) for k in kits] == [("Ana, B.", -12.5), ("Ivo", 10.0)]


@pytest.mark.parametrize("first_line, sep", [("", ";"), ("", "\t"), ("sep=;\r\n", ";"), ('"sep=;"\r\n', ";"),
                                             ("SEP=,\r\n", ",")])
def test_a_spreadsheets_decimal_commas_and_separator_line(tmp_path, first_line, sep):
    """A roster saved where the comma is the decimal sign: separated by
    semicolons (or tabs), each number's decimal comma as the spreadsheet
    wrote it (51,48), read as the number it is; and a first line "sep=;",
    which spreadsheets write to name the separator (common practice, no
    published source), names it and is no row.  Row numbers stay the
    file's own.  In a comma-separated roster a decimal comma is still
    refused, with its own message: there it may be a mistake."""
    from kitgen.batch.setfile import load_set

    (tmp_path / "set.yaml").write_text("defaults: {epoch: 2027}\nroster: r.csv\n")
    numbers = sep != ","
    rows = [["owner", "latitude", "longitude", "timezone", "diameter_mm"],
            ["Ana", "51,48" if numbers else "51.48", "0,12W" if numbers else "0.12W", "Europe/London",
             "150,5" if numbers else "150.5"],
            ["Ivo", "-33,9" if numbers else '"-33,9"', "", "", ""]]
    (tmp_path / "r.csv").write_text(first_line + "\r\n".join(sep.join(row) for row in rows) + "\r\n",
                                    encoding="utf-8")
    kits = load_set(tmp_path / "set.yaml").kits
    assert (kits[0].recipe.latitude_deg, kits[0].recipe.longitude_deg, kits[0].recipe.diameter_mm) == \
        (51.48, -0.12, 150.5)
    if numbers:
        assert kits[1].recipe.latitude_deg == -33.9
    else:
        assert kits[1].recipe is None and "decimal comma" in kits[1].error.text()
    row = 3 + (1 if first_line else 0)
    assert f"row {row}" in kits[1].where.text()


def test_a_run_leaves_no_pool_thread_behind(tmp_path, monkeypatch):
    """Each worker's pool is told to shut down, without waiting, as the
    last kit comes in; the run must still end only once the pools'
    managing threads have (Python's concurrent.futures: a thread still
    ending at the process's exit met the exit handler of the pools, which
    printed a traceback).  The threads' last step is slowed here so that
    one is surely still running when the kits are done."""
    import threading
    import time
    from concurrent.futures import process

    from kitgen.batch import run_set

    original = process._ExecutorManagerThread.join_executor_internals

    def slowly(self):
        time.sleep(0.3)
        original(self)

    monkeypatch.setattr(process._ExecutorManagerThread, "join_executor_internals", slowly)
    (tmp_path / "s.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": [{"owner": "A"}, {"owner": "B"}]}))
    before = set(threading.enumerate())
    summary = run_set(tmp_path / "s.yaml", tmp_path / "out", jobs=2, quiet=True)
    assert summary.exit_status == 0 and summary.jobs == 2
    assert [t for t in threading.enumerate() if t not in before] == []


def test_print_files_embed_every_font_they_name(one_worker):
    """PDF 32000-1:2008, 9.8 and 9.9: every font a print file's pages and
    stamps name carries its program (FontFile2), and none is one of the
    standard 14, which need not be embedded (9.6.2.2)."""
    from .test_pdf_kit import STANDARD_14, _fonts_of

    status, out = one_worker
    for material in ("card", "film"):
        count = 0
        for page in PdfReader(out / f"print-{material}.pdf").pages:
            for font in _fonts_of(page.get("/Resources"), set()):
                count += 1
                base = str(font.get("/BaseFont", "")).lstrip("/")
                assert base.split("+", 1)[-1] not in STANDARD_14, (material, base)
                assert "/FontFile2" in font["/FontDescriptor"].get_object(), (material, base)
        assert count > 0


@pytest.mark.parametrize("spans", [[(1, 4)], [(5, 8), (9, 12)], [(3, 3)], [(1, 1), (2, 2)], [(10, 12), (13, 15)]])
def test_manifest_opens_in_a_spreadsheet_as_written(spans):
    # The byte order mark EF BB BF (The Unicode Standard, sec. 23.8) is how
    # spreadsheet programs tell a UTF-8 file from their code page (common
    # practice, no source).  A page range must not be read as a date: the
    # general-purpose parser python-dateutil stands in for a spreadsheet's
    # guess (it reads "1-4", with a hyphen, as a date); a cell that is one
    # whole number stays a number.
    from dateutil import parser as dates

    from kitgen.batch.manifest import COLUMNS, manifest_csv, manifest_row
    from kitgen.batch.setfile import SetKit

    assert dates.parse("1-4").month in (1, 4)   # the check below can fail
    row = {c: "" for c in COLUMNS}
    row.update(kit=1, owner="Ñuñoa Ødegård", status="ok")
    data = manifest_csv([row])
    assert data.startswith(b"\xef\xbb\xbf")
    assert next(csv.DictReader(data.decode("utf-8-sig").splitlines()))["owner"] == "Ñuñoa Ødegård"
    kit = SetKit(number=1, where=None, tree={"owner": "A"}, copies=1)
    cells = manifest_row(kit, "", None, {"card": spans}, "failed")["card_print_pages"].split(" ")
    assert len(cells) == len(spans)
    for cell, (first, last) in zip(cells, spans):
        if first == last:
            assert cell == str(first)
        else:
            assert re.findall(r"\d+", cell) == [str(first), str(last)]
            with pytest.raises((ValueError, OverflowError)):
                dates.parse(cell)


def test_a_file_that_cannot_be_written_ends_the_run_in_one_line_and_leaves_nothing(tmp_path, capsys, monkeypatch):
    """A kit's file that cannot be written (a full disk: ENOSPC at its
    flush, made so here) ends the run with one line, the English
    template's words for a full disk in it (PyYAML), status 2, and leaves
    nothing: no output folder, no temporary one, no writing thread (the
    files are written beside the build, kitgen.batch.folder.BackgroundWrites)."""
    import errno
    import threading

    from kitgen.batch import folder

    calls = []
    real_fsync = os.fsync

    def full_disk(fd):
        calls.append(fd)
        if len(calls) == 2:
            raise OSError(errno.ENOSPC, os.strerror(errno.ENOSPC))
        real_fsync(fd)

    monkeypatch.setattr(folder.os, "fsync", full_disk)
    kits = [{"owner": name} for name in ("Ivo", "Uma", "Ada", "Bo")]
    (tmp_path / "s.yaml").write_text(yaml.safe_dump({"defaults": DEFAULTS, "kits": kits}))
    before = set(threading.enumerate())
    assert main(["batch", str(tmp_path / "s.yaml"), "-o", str(tmp_path / "out"), "--quiet", "--jobs", "1"]) == 2
    err = capsys.readouterr().err.strip().splitlines()
    full = _template("en")["errors"]["write_disk_full"]
    assert len(err) == 1 and err[0].startswith("kitgen: ") and err[0].endswith(full), err
    assert sorted(p.name for p in tmp_path.iterdir()) == ["s.yaml"]
    assert [t for t in threading.enumerate() if t not in before] == []
