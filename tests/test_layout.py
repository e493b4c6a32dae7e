"""The package's layout rules, read from the source: no module imports one that imports it
back (directly or around a loop), counting imports inside functions too; imports under
``if TYPE_CHECKING:`` are for annotations only and are not counted. Also the size limits
the contributor guide sets for the page script and the target solver."""
import ast
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
PKG = ROOT / "solutions"


def _modules() -> dict[str, Path]:
    out = {}
    for p in PKG.rglob("*.py"):
        parts = p.relative_to(ROOT).with_suffix("").parts
        name = ".".join(parts[:-1] if parts[-1] == "__init__" else parts)
        out[name] = p
    return out


def _runtime_nodes(tree: ast.AST):
    """Every node except those under ``if TYPE_CHECKING:``."""
    stack = [tree]
    while stack:
        node = stack.pop()
        if isinstance(node, ast.If) and "TYPE_CHECKING" in ast.unparse(node.test):
            stack.extend(node.orelse)
            continue
        yield node
        stack.extend(ast.iter_child_nodes(node))


def import_graph() -> dict[str, set[str]]:
    mods = _modules()
    graph = {m: set() for m in mods}
    for m, p in mods.items():
        pkg = m if p.name == "__init__.py" else m.rsplit(".", 1)[0]
        for node in _runtime_nodes(ast.parse(p.read_text(encoding="utf-8"))):
            if isinstance(node, ast.Import):
                graph[m] |= {a.name for a in node.names if a.name in mods}
            elif isinstance(node, ast.ImportFrom):
                if node.level:
                    base = pkg.split(".")[:len(pkg.split(".")) - (node.level - 1)]
                    mod = ".".join(base + ([node.module] if node.module else []))
                else:
                    mod = node.module or ""
                for a in node.names:
                    if f"{mod}.{a.name}" in mods:
                        graph[m].add(f"{mod}.{a.name}")
                    elif mod in mods:
                        graph[m].add(mod)
        graph[m].discard(m)
    return graph


def cycles(graph: dict[str, set[str]]) -> list[list[str]]:
    """Strongly connected groups of more than one module (Tarjan)."""
    index, low, stack, on, out, counter = {}, {}, [], set(), [], [0]

    def visit(v):
        index[v] = low[v] = counter[0]
        counter[0] += 1
        stack.append(v)
        on.add(v)
        for w in graph[v]:
            if w not in index:
                visit(w)
                low[v] = min(low[v], low[w])
            elif w in on:
                low[v] = min(low[v], index[w])
        if low[v] == index[v]:
            group = []
            while True:
                w = stack.pop()
                on.discard(w)
                group.append(w)
                if w == v:
                    break
            if len(group) > 1:
                out.append(sorted(group))

    for v in sorted(graph):
        if v not in index:
            visit(v)
    return out


def test_the_checker_sees_a_cycle():
    assert cycles({"a": {"b"}, "b": {"c"}, "c": {"a"}, "d": {"a"}}) == [["a", "b", "c"]]


def test_no_module_imports_one_that_imports_it_back():
    assert cycles(import_graph()) == []


def test_size_limits_of_the_page_script_and_the_solver():
    def lines(p):
        return len(p.read_text(encoding="utf-8").splitlines())
    assert lines(ROOT / "streamlit_app.py") < 150
    assert lines(PKG / "targeting.py") < 400
