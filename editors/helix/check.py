#!/usr/bin/env python3
"""Parse editors/helix/languages.toml with tomllib and check the Caloris entries."""
import pathlib
import sys
import tomllib

path = pathlib.Path(__file__).with_name("languages.toml")
passed = failed = 0


def report(ok, what, detail=None):
    global passed, failed
    if ok:
        passed += 1
        print(f"ok - {what}")
    else:
        failed += 1
        print(f"not ok - {what}" + (f": {detail!r}" if detail is not None else ""))


try:
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    report(True, "languages.toml parses (tomllib)")
except tomllib.TOMLDecodeError as err:
    report(False, "languages.toml parses (tomllib)", str(err))
    data = {}

server = data.get("language-server", {}).get("caloris", {})
report(server.get("command") == "caloris" and server.get("args") == ["lsp"],
       "language-server.caloris runs `caloris lsp`", server)
langs = [lang for lang in data.get("language", []) if lang.get("name") == "heat"]
report(len(langs) == 1, "exactly one [[language]] named heat", len(langs))
lang = langs[0] if langs else {}
report(lang.get("file-types") == ["heat"], "file-types = [\"heat\"]", lang.get("file-types"))
report(lang.get("comment-token") == "#", "comment-token = \"#\"", lang.get("comment-token"))
report(lang.get("language-servers") == ["caloris"], "language-servers = [\"caloris\"]",
       lang.get("language-servers"))
report(isinstance(lang.get("scope"), str) and isinstance(lang.get("roots"), list),
       "scope and roots are present", {k: lang.get(k) for k in ("scope", "roots")})
print(f"helix: {passed} passed, {failed} failed")
sys.exit(1 if failed else 0)
