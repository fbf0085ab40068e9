"""The README matches the program: its example runs, every option and output is documented."""

from __future__ import annotations

import re

import pandas as pd
from conftest import DEMO, ROOT, borrowed_labels

from drift.cli import build_parser

README = (ROOT / "README.md").read_text(encoding="utf-8")
#: the README and every page of docs/: what a user can read
DOCS = "\n".join([README] + [p.read_text(encoding="utf-8") for p in sorted((ROOT / "docs").glob("*.md"))])
API_PAGE = (ROOT / "docs" / "api.md").read_text(encoding="utf-8")


def test_first_lines_are_the_two_setup_commands():
    block = re.search(r"```\n(.*?)```", README, re.S).group(1).strip().splitlines()
    assert block == ["pip install . && drift run demo_seasons --out drift-report",
                     "pip install '.[test]' && python -m pytest"]


def test_ci_runs_the_readme_test_line_word_for_word():
    assert "pip install '.[test]' && python -m pytest" in (ROOT / ".ci" / "run").read_text()


def test_python_example_runs(tmp_path, monkeypatch):
    code = re.search(r"```python\n(.*?)```", API_PAGE, re.S).group(1)
    code = code.replace('"demo_seasons"', repr(str(DEMO)))
    monkeypatch.chdir(tmp_path)
    exec(compile(code, "README.md", "exec"), {})
    assert (tmp_path / "model.json").exists()


def test_every_cli_option_is_documented():
    parser = build_parser()
    sub = next(a for a in parser._actions if a.dest == "command")
    for name, p in sub.choices.items():
        assert f"drift {name}" in README
        for action in p._actions:
            for flag in action.option_strings:
                if flag not in ("-h", "--help"):
                    assert flag in DOCS, f"{name} {flag} is not in the docs"


def test_every_output_file_and_column_is_documented(small_run):
    code, out = small_run  # a run with --previous writes every file drift can write
    assert code == 0
    for path in out.iterdir():
        assert f"`{path.name}`" in DOCS, path.name
    moves = pd.read_csv(out / "moves.csv", nrows=1)
    for col in moves.columns:
        generic = re.sub(r"driver_\d", "driver_k", re.sub(r"pc\d+$", "pc1", col))
        assert col in DOCS or generic in DOCS or col.startswith("driver_"), col


def test_readme_is_a_landing_page_and_its_links_resolve():
    assert len(README.splitlines()) <= 150
    for target in re.findall(r"\]\(([^)#:]+)(?:#[^)]*)?\)", DOCS):
        if not target.startswith("http"):
            assert (ROOT / target).exists() or (ROOT / "docs" / target).exists(), target


def test_no_published_role_label_in_anything_a_user_reads():
    """Docs, the demo's README and the package itself (messages, templates) use drift's own role words."""
    texts = {"docs": DOCS, "demo_seasons/README.md": (DEMO / "README.md").read_text(encoding="utf-8"),
             "DEVELOPERS.md": (ROOT / "DEVELOPERS.md").read_text(encoding="utf-8")}
    for path in sorted((ROOT / "drift").rglob("*")):
        if path.suffix in (".py", ".html", ".js", ".css"):
            texts[str(path.relative_to(ROOT))] = path.read_text(encoding="utf-8")
    assert {where: borrowed_labels(text) for where, text in texts.items() if borrowed_labels(text)} == {}


def test_docs_name_the_distribution():
    """The index name differs from the command and the import package; README and docs say which is which."""
    import tomllib
    from importlib.metadata import PackageNotFoundError, version

    import drift
    from drift.constants import DISTRIBUTION

    project = tomllib.loads((ROOT / "pyproject.toml").read_text(encoding="utf-8"))["project"]
    # "drift" is taken on the public index by an unrelated project (pip index versions drift: 0.0.7)
    assert project["name"] == DISTRIBUTION != "drift"
    assert project["scripts"] == {"drift": "drift.cli:main"}  # the command keeps its name
    assert f"`{DISTRIBUTION}`" in README and f"`{DISTRIBUTION}`" in DOCS.replace(README, "")
    try:
        installed = version(DISTRIBUTION)
    except PackageNotFoundError:  # run from a checkout that was never installed
        return
    assert installed == drift.__version__  # one version: pyproject reads drift.__version__
