"""The code's shape: small modules, classes and functions, and no import cycles among drift's modules."""

from __future__ import annotations

import ast
from pathlib import Path

DRIFT = Path(__file__).resolve().parent.parent / "drift"
MODULES = sorted(DRIFT.rglob("*.py"))

# limits from DEVELOPERS.md, "Rules the code keeps" (house rule, no source)
MAX_MODULE, MAX_CLASS, MAX_FUNCTION = 400, 250, 80


def _name(path: Path) -> str:
    parts = list(path.relative_to(DRIFT.parent).with_suffix("").parts)
    return ".".join(parts[:-1] if parts[-1] == "__init__" else parts)


def test_no_module_class_or_function_too_long():
    too_long = []
    for path in MODULES:
        text = path.read_text(encoding="utf-8")
        if len(text.splitlines()) > MAX_MODULE:
            too_long.append(f"{_name(path)}: {len(text.splitlines())} lines")
        for node in ast.walk(ast.parse(text)):
            limit = (MAX_CLASS if isinstance(node, ast.ClassDef)
                     else MAX_FUNCTION if isinstance(node, (ast.FunctionDef, ast.AsyncFunctionDef))
                     else None)
            if limit is not None and node.end_lineno - node.lineno + 1 > limit:
                too_long.append(f"{_name(path)}.{node.name}: {node.end_lineno - node.lineno + 1} lines")
    assert not too_long, too_long


def _imports(path: Path) -> set:
    """drift modules imported by ``path`` anywhere in it (also inside functions)."""
    own = _name(path)
    package = own if path.name == "__init__.py" else own.rpartition(".")[0]
    found = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.Import):
            found |= {a.name for a in node.names if a.name.startswith("drift")}
        elif isinstance(node, ast.ImportFrom):
            base = package.split(".")
            if node.level:
                base = base[: len(base) - node.level + 1]
                target = ".".join(base + ([node.module] if node.module else []))
            else:
                target = node.module or ""
            if not target.startswith("drift"):
                continue
            found.add(target)
            found |= {f"{target}.{a.name}" for a in node.names}
    return found


def test_no_import_cycles():
    names = {_name(p): p for p in MODULES}
    graph = {n: {m for m in _imports(p) if m in names and m != n}
             for n, p in names.items()}
    # a package's __init__ re-exporting its own modules is not a cycle of stages
    graph = {n: {m for m in deps if not n.startswith(m + ".")} for n, deps in graph.items()}
    for n in graph:
        if n in ("drift",):
            graph[n] = set()  # lazy re-exports on first use, by name only
    state, cycles = {}, []

    def visit(node, stack):
        state[node] = "open"
        for nxt in sorted(graph[node]):
            if state.get(nxt) == "open":
                cycles.append(stack[stack.index(nxt):] + [nxt])
            elif nxt not in state:
                visit(nxt, stack + [nxt])
        state[node] = "done"

    for node in sorted(graph):
        if node not in state:
            visit(node, [node])
    assert not cycles, cycles


#: the stages in the order data flows; a stage may import only itself and earlier stages
FLOW = ("intake", "model", ("measure", "outlook"), ("report", "output"), "sim")
#: top-level modules any stage may use (the wiring -- api, cli, config, placing -- is not among them)
SHARED = {"drift", "drift.errors", "drift.constants", "drift.settings_rules", "drift.progress", "drift.threads",
          "drift.messages"}


def _stage(module: str):
    parts = module.split(".")
    return parts[1] if len(parts) > 1 and (DRIFT / parts[1]).is_dir() else None


def _rank(stage):
    return next(i for i, s in enumerate(FLOW) if stage == s or (isinstance(s, tuple) and stage in s))


def test_data_flows_one_way_between_stage_subpackages():
    names = {_name(p): p for p in MODULES}
    against = []
    for name, path in names.items():
        own = _stage(name)
        if own is None:
            continue
        for target in _imports(path):
            if target not in names:
                continue
            other = _stage(target)
            if other is None:
                if target not in SHARED and not (own == "sim" and target == "drift.config"):
                    against.append(f"{name} -> {target} (wiring)")
            elif other != own and _rank(other) > _rank(own):
                against.append(f"{name} -> {target}")
            elif other != own and _rank(other) == _rank(own):
                against.append(f"{name} -> {target} (sibling stage)")
    assert not against, against


def test_top_level_holds_only_the_wiring():
    top = sorted(p.stem for p in DRIFT.glob("*.py") if p.stem not in ("__init__", "__main__"))
    assert len(top) <= 12, top


def test_every_stage_says_what_comes_in_and_goes_out_and_exports_its_names():
    import importlib

    for folder in sorted(p for p in DRIFT.iterdir() if (p / "__init__.py").exists()):
        module = importlib.import_module(f"drift.{folder.name}")
        doc = module.__doc__ or ""
        assert "In\n" in doc and "Out\n" in doc, folder.name
        for name in module.__all__:
            assert getattr(module, name) is not None, f"drift.{folder.name}.{name}"
