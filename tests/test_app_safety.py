"""The dashboard never shows a traceback, never renders what a user typed as Markdown or
HTML, reads only inputs within its limits, and writes only into its own file.

Markdown rendering is checked with an outside renderer, ``markdown-it-py`` in its
GitHub-flavoured preset with ``linkify`` (bare URLs become links, as in Streamlit's
renderer): a page text holding a pasted ``![x](http://…)`` or ``<img src=…>`` must give
neither an ``<img>`` nor an ``<a>`` element there.
"""
import html
import io
import re
from pathlib import Path

import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from markdown_it import MarkdownIt
from streamlit.testing.v1 import AppTest

from solutions.ui import state as S
from solutions.ui.safe import (MAX_CELL_CHARS, MAX_ROWS, WJ, InputLimitError, plain,
                               plain_frame, user_library_path)
from solutions.ui.tables import frame_from_text, frame_from_upload

ROOT = Path(__file__).resolve().parents[1]
APP = str(ROOT / "streamlit_app.py")
TIMEOUT = 120
MD = MarkdownIt("gfm-like")       # tables, strikethrough, linkify
# like GitHub's rule, link only addresses with a scheme or "www." (linkify-it's "fuzzy"
# mode would also link any bare domain name, which GFM does not)
MD.linkify.set({"fuzzy_link": False})

IMG = "![x](http://127.0.0.1:1/b.png)"
TAG = '<img src="http://127.0.0.1:1/c.png">'
LINK = "www.example.com/a"



def result_metrics(at):
    """The headline metrics of the results section (the tool tabs below have their own)."""
    from solutions.properties import PROPERTIES
    labels = {q.label for q in PROPERTIES}
    return [m for m in at.metric if m.label in labels]

def rendered(text: str) -> str:
    return MD.render(text)


def no_markup(text: str) -> bool:
    out = rendered(text)
    return "<img" not in out and "<a " not in out


def page_texts(at) -> list[str]:
    """Every text the page renders as Markdown: bodies of markdown, captions, alerts,
    metric labels and values, and the cells and headers of every st.table."""
    out = [e.value for kind in ("markdown", "caption", "error", "warning", "info", "success")
           for e in getattr(at, kind)]
    for m in at.metric:
        out += [m.label, m.value]
    for t in at.table:
        out += [str(c) for c in t.value.columns]
        out += [str(v) for v in t.value.to_numpy().ravel()]
    return out


def run_with_table(rows: list[dict], **state) -> AppTest:
    at = AppTest.from_file(APP, default_timeout=TIMEOUT)
    for k, v in state.items():
        at.session_state[k] = v
    at.session_state["recipe_table"] = pd.DataFrame(rows)
    at.run()
    return at


def assert_plain_page(at):
    assert not at.exception
    for t in page_texts(at):
        assert no_markup(t), t
        assert "Traceback" not in t and 'File "' not in t and "/work/" not in t, t


# ------------------------------------------------------------------ Markdown
def test_the_outside_renderer_does_make_images_and_links():
    """The check can fail: unescaped, these texts do give an image, an HTML tag kept
    as-is (Streamlit would then see raw HTML) and a bare link."""
    assert "<img" in rendered(IMG)
    assert "<a " in rendered("see http://127.0.0.1:1/a")
    assert "<img" in MarkdownIt("gfm-like", {"html": True}).render(TAG)


def test_pasted_names_are_never_rendered_as_images_or_links():
    """Names defined on the page (with a formula, so they are evaluated) and unknown
    names (quoted in the row's error) are shown as typed."""
    rows = [{"ingredient": IMG, "amount": "1", "unit": "g", "formula": "NaCl"},
            {"ingredient": TAG, "amount": "1", "unit": "g"},
            {"ingredient": LINK, "amount": "1", "unit": "g"},
            {"ingredient": "water", "amount": "100", "unit": "g"}]
    at = run_with_table(rows, recipe_name=IMG)
    assert_plain_page(at)
    shown = " ".join(page_texts(at))
    assert plain(IMG) in shown and plain(TAG) in shown     # shown, as typed
    assert at.metric                                       # the defined row was evaluated


def test_breaking_the_escape_is_caught(monkeypatch):
    """With the escape switched off the same page does render an image: the test above
    would fail."""
    import solutions.ui.sections as sections
    monkeypatch.setattr(sections, "plain_frame", lambda df: df)
    sections.st.cache_resource.clear()      # the shown frames are cached per page
    try:
        at = run_with_table([{"ingredient": IMG, "amount": "1", "unit": "g",
                              "formula": "NaCl"},
                             {"ingredient": "water", "amount": "100", "unit": "g"}])
        assert any(not no_markup(t) for t in page_texts(at))
    finally:
        sections.st.cache_resource.clear()  # no unescaped frame stays in the cache


@settings(max_examples=300, deadline=None)
@given(st.text(alphabet=st.characters(blacklist_categories=("Cc", "Cs", "Zl", "Zp")),
               max_size=60).map(str.strip))
def test_plain_shows_any_line_as_typed(text):
    """Property: one line through :func:`plain` renders as one paragraph holding exactly
    the typed characters, with no element inside."""
    out = rendered(plain(text))
    if not text:
        assert out == ""
        return
    m = re.fullmatch(r"<p>(.*)</p>\n", out, re.S)
    assert m, (text, out)
    assert "<" not in m.group(1)
    assert html.unescape(m.group(1)).replace(WJ, "") == text.replace(WJ, "")


@given(st.text(max_size=40))
def test_plain_escapes_streamlit_directives(text):
    """Streamlit's own :color[…], :material/…: and $…$ never start: every ``:``, ``[``
    and ``$`` is backslash-escaped."""
    out = plain(text + ":red[x] $y$")
    assert not re.search(r"(?<!\\)(\\\\)*[:\[$]", out.replace("\\\\", ""))


#: the bare-link patterns of GitHub-flavoured Markdown as its mdast transform applies them
#: to text after escapes are resolved (mdast-util-gfm-autolink-literal; from memory)
_GFM_BARE = [re.compile(r"(https?://|www(?=\.))([-.\w]+)", re.I | re.A),
             re.compile(r"([-.\w+]+)@([-\w]+(?:\.[-\w]+)+)", re.A)]


def _unescaped(md: str) -> str:
    return re.sub(r"\\([!-/:-@\[-`{-~])", r"\1", md)


@pytest.mark.parametrize("text", [IMG, TAG, LINK, "see http://x.org", "mail a@b.com",
                                  "HTTPS://EXAMPLE.ORG"])
def test_plain_breaks_bare_links_after_escapes_are_resolved(text):
    """Streamlit's renderer finds bare links in the text *after* escapes are resolved, so
    escaping alone is not enough (the raw text would match): the word joiner is."""
    assert any(p.search(_unescaped(text)) for p in _GFM_BARE)
    assert not any(p.search(_unescaped(plain(text))) for p in _GFM_BARE)


def test_plain_frame_keeps_numbers_readable():
    df = plain_frame(pd.DataFrame({"Ingredient": [IMG], "Value": ["-0.532"], "n": [1.5]}))
    assert df.loc[0, "Value"] == "-0.532" and df.loc[0, "n"] == 1.5
    assert no_markup(df.loc[0, "Ingredient"])


# ------------------------------------------------------------------ bad inputs: plain messages
def test_header_only_paste():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    at.text_area(key="paste_text").input("ingredient\tamount\tunit\n").run()
    at.button(key="paste_apply").click().run()
    assert_plain_page(at)
    assert any("header line but no ingredient rows" in c.value for c in at.caption)
    assert any(e.value.startswith("No results: the recipe table is empty") for e in at.error)


def _xlsx(df: pd.DataFrame) -> bytes:
    b = io.BytesIO()
    df.to_excel(b, index=False)
    return b.getvalue()


def test_header_only_xlsx_upload():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    data = _xlsx(pd.DataFrame(columns=["ingredient", "amount", "unit"]))
    at.file_uploader(key="upload").upload("empty.xlsx", data).run()
    assert_plain_page(at)
    assert any("header line but no ingredient rows" in c.value for c in at.caption)


def test_non_workbook_xlsx_upload():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    at.file_uploader(key="upload").upload("recipe.xlsx", b"this is not a workbook").run()
    assert_plain_page(at)
    notes = [c.value for c in at.caption]
    assert any("not a readable \\.xlsx workbook" in n or "not a readable .xlsx workbook" in n
               for n in notes), notes
    assert at.metric            # the table was left as it was: the demo still evaluates


def test_percent_w_w_totalling_100_with_balance_water():
    at = run_with_table([{"ingredient": "sucrose", "amount": "60", "unit": "% w/w"},
                         {"ingredient": "glycerol", "amount": "40", "unit": "% w/w"},
                         {"ingredient": "water", "amount": "balance", "unit": ""}])
    assert_plain_page(at)
    assert any(e.value.startswith("No results:") for e in at.error)
    assert not result_metrics(at)


@pytest.mark.parametrize("unit", ["__import__('os')", "mg/" * 5000])
def test_hostile_unit_text(unit):
    at = run_with_table([{"ingredient": "sucrose", "amount": "10", "unit": unit},
                         {"ingredient": "water", "amount": "90", "unit": "g"}])
    assert_plain_page(at)
    errors = " ".join(e.value for e in at.error)
    assert "row 1" in errors or "characters in a cell" in errors, errors
    assert not result_metrics(at)


def test_cell_over_128_KiB():
    big = "x" * (128 * 1024 + 1)
    with pytest.raises(InputLimitError) as exc:
        frame_from_text(f"{big}\t1\tg\nwater\t99\tg")
    assert exc.value.limit == MAX_CELL_CHARS and exc.value.value == len(big)
    at = run_with_table([{"ingredient": big, "amount": "1", "unit": "g"},
                         {"ingredient": "water", "amount": "99", "unit": "g"}])
    assert_plain_page(at)
    assert any("characters in a cell" in e.value for e in at.error)
    # ...and pasted: the table stays as it was, with the reason
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    at.text_area(key="paste_text").input(f"{big}\t1\tg\nwater\t99\tg").run()
    at.button(key="paste_apply").click().run()
    assert_plain_page(at)
    assert any("characters in a cell" in c.value for c in at.caption)


def test_row_limit():
    text = "\n".join(f"sucrose\t{i}\tg" for i in range(MAX_ROWS + 5))
    with pytest.raises(InputLimitError) as exc:
        frame_from_text(text)
    assert exc.value.value == MAX_ROWS + 5 and exc.value.limit == MAX_ROWS
    assert str(exc.value) == (f"the pasted block has {MAX_ROWS + 5} rows; the page reads "
                              f"at most {MAX_ROWS} rows")


def test_upload_size_limit(monkeypatch):
    monkeypatch.setenv("SOLUTIONS_MAX_UPLOAD_MB", "0.001")
    with pytest.raises(InputLimitError) as exc:
        frame_from_upload("r.csv", b"ingredient,amount,unit\n" + b"salt,1,g\n" * 200)
    assert exc.value.limit == 1048


def test_empty_library_path_falls_back_to_the_apps_own_file(tmp_path, monkeypatch):
    monkeypatch.setenv("HOME", str(tmp_path))
    monkeypatch.setenv("SOLUTIONS_USER_LIBRARY", "")
    assert user_library_path() == tmp_path / ".solutions" / "user_library.csv"
    state = dict(S.DEFAULTS, custom_ingredients=[S.custom_ingredient("my osmolyte", "",
                                                                    150.0)])
    S.on_save_library(state)
    assert state["library_message"] == "saved 1 ingredient(s) to your ingredient file"
    assert (tmp_path / ".solutions" / "user_library.csv").is_file()


def test_save_failure_is_a_plain_message(tmp_path, monkeypatch):
    blocker = tmp_path / "file"
    blocker.write_text("x")
    monkeypatch.setenv("SOLUTIONS_USER_LIBRARY", str(blocker / "sub" / "lib.csv"))
    state = dict(S.DEFAULTS, custom_ingredients=[S.custom_ingredient("my osmolyte", "",
                                                                    150.0)])
    S.on_save_library(state)
    msg = state["library_message"]
    assert msg.startswith("error: could not save your ingredients") and str(tmp_path) not in msg


def test_no_path_box_on_the_page():
    at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    assert not [t for t in at.text_input if "file" in t.label.lower()]


def test_an_unforeseen_error_in_a_section_is_a_plain_message(monkeypatch):
    """A defect inside one section shows "internal error … please report" and the other
    sections still draw."""
    import solutions.ui.sections as sections

    def boom(*a, **k):
        raise RuntimeError("/secret/path/module.py exploded")
    monkeypatch.setattr(sections, "composition_frame", boom)
    sections.st.cache_resource.clear()      # the shown frames are cached per page
    try:
        at = AppTest.from_file(APP, default_timeout=TIMEOUT).run()
    finally:
        sections.st.cache_resource.clear()
    assert not at.exception
    errors = [e.value for e in at.error]
    assert any(e.startswith("Internal error in the results section; please report it")
               for e in errors), errors
    assert not any("/secret" in e for e in errors)
    assert [h.value for h in at.header if h.value == "Conditions"]


# ------------------------------------------------------------------ configuration
def test_config_hides_error_details_and_limits_uploads():
    import tomllib
    cfg = tomllib.loads((ROOT / ".streamlit" / "config.toml").read_text())
    assert cfg["client"]["showErrorDetails"] == "none"
    assert 1 <= cfg["server"]["maxUploadSize"] <= 10          # MB
    assert cfg["server"]["address"] == "127.0.0.1"


def test_browser_tests_fail_not_skip_under_ci_without_chromium(monkeypatch, tmp_path):
    """CI=true and no Chromium: the browser tests fail (a broken install cannot pass)."""
    import importlib.util
    spec = importlib.util.spec_from_file_location("browser_tests",
                                                  ROOT / "tests" / "test_browser.py")
    mod = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(mod)
    monkeypatch.setattr(mod, "CHROMIUM", str(tmp_path / "no-such-chromium"))
    monkeypatch.setenv("CI", "true")
    with pytest.raises(pytest.fail.Exception):
        mod._need_browser()
    monkeypatch.setenv("CI", "false")
    with pytest.raises(pytest.skip.Exception):
        mod._need_browser()
