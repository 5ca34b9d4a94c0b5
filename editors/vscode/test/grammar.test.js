// Grammar test: tokenizes a few lines with the real TextMate engine VS Code uses
// (vscode-textmate + vscode-oniguruma) and checks the scopes of selected tokens.
// Run with: node --test test/
"use strict";
const test = require("node:test");
const assert = require("node:assert/strict");
const fs = require("node:fs");
const path = require("node:path");
const vsctm = require("vscode-textmate");
const oniguruma = require("vscode-oniguruma");

const root = path.join(__dirname, "..");
const grammarPath = path.join(root, "syntaxes", "heat.tmLanguage.json");

async function loadGrammar() {
  const wasm = fs.readFileSync(require.resolve("vscode-oniguruma/release/onig.wasm"));
  await oniguruma.loadWASM(wasm.buffer.slice(wasm.byteOffset, wasm.byteOffset + wasm.byteLength));
  const registry = new vsctm.Registry({
    onigLib: Promise.resolve({
      createOnigScanner: (patterns) => new oniguruma.OnigScanner(patterns),
      createOnigString: (s) => new oniguruma.OnigString(s),
    }),
    loadGrammar: async (scopeName) => {
      if (scopeName !== "source.heat") return null;
      return vsctm.parseRawGrammar(fs.readFileSync(grammarPath, "utf8"), grammarPath);
    },
  });
  return registry.loadGrammar("source.heat");
}

// Tokenize `lines` and return [{text, scopes}] for every token.
function tokenize(grammar, lines) {
  let state = vsctm.INITIAL;
  const out = [];
  for (const line of lines) {
    const r = grammar.tokenizeLine(line, state);
    state = r.ruleStack;
    for (const t of r.tokens) {
      out.push({ text: line.slice(t.startIndex, t.endIndex), scopes: t.scopes });
    }
  }
  return out;
}

function scopesOf(tokens, text) {
  const tok = tokens.find((t) => t.text === text);
  assert.ok(tok, `no token with text ${JSON.stringify(text)}; tokens: ${JSON.stringify(tokens.map((t) => t.text))}`);
  return tok.scopes;
}

function assertScope(tokens, text, scope) {
  const scopes = scopesOf(tokens, text);
  assert.ok(scopes.includes(scope), `${JSON.stringify(text)} has scopes ${scopes.join(" ")}, expected ${scope}`);
}

let grammar;
test.before(async () => {
  grammar = await loadGrammar();
});

test("grammar has scopeName source.heat", () => {
  assert.equal(grammar !== null, true);
});

test("comment, keyword, string on a title line", () => {
  const toks = tokenize(grammar, ['title "LED downlight"  # the model name']);
  assertScope(toks, "title", "keyword.other.title.heat");
  assertScope(toks, "LED downlight", "string.quoted.double.heat");
  assertScope(toks, " the model name", "comment.line.number-sign.heat");
  assertScope(toks, "#", "punctuation.definition.comment.heat");
});

test("numbers with units, declared names, functions", () => {
  const toks = tokenize(grammar, [
    "material aluminium (k = 205 W/(m*K))",
    "link die_attach: junction to slug contact(r = 0.2 cm^2*K/W, area = 9 mm^2)",
    "limit junction_rating: temperature(junction) < 110 °C",
  ]);
  assertScope(toks, "material", "keyword.other.material.heat");
  assertScope(toks, "aluminium", "entity.name.type.material.heat");
  assertScope(toks, "205", "constant.numeric.heat");
  assertScope(toks, "W/(m*K)", "keyword.other.unit.heat");
  assertScope(toks, "die_attach", "entity.name.variable.link.heat");
  assertScope(toks, "to", "keyword.other.to.heat");
  assertScope(toks, "contact", "support.function.element.heat");
  assertScope(toks, "cm^2*K/W", "keyword.other.unit.heat");
  assertScope(toks, "temperature", "support.function.measure.heat");
  assertScope(toks, "<", "keyword.operator.comparison.heat");
  assertScope(toks, "°C", "keyword.other.unit.heat");
});

test("a space separates arithmetic from the unit", () => {
  const toks = tokenize(grammar, ["param a = 2 m * h + 1 / (7.7 W/(m^2*K))"]);
  assertScope(toks, "m", "keyword.other.unit.heat");
  assertScope(toks, "*", "keyword.operator.arithmetic.heat");
  assertScope(toks, "h", "variable.other.heat");
  // The unit stops at its own closing parenthesis; the outer one is punctuation.
  assertScope(toks, "W/(m^2*K)", "keyword.other.unit.heat");
  assert.equal(toks[toks.length - 1].text, ")");
  assert.ok(toks[toks.length - 1].scopes.includes("punctuation.section.parens.end.heat"));
});

test("build-up elements and the sample file tokenize without invalid scopes", () => {
  const toks = tokenize(grammar, [
    "buildup wall {",
    "  inside: film(r = 0.13 m^2*K/W)",
    "}",
  ]);
  assertScope(toks, "wall", "entity.name.type.buildup.heat");
  assertScope(toks, "inside", "entity.name.variable.element.heat");
  const sample = fs.readFileSync(path.join(root, "..", "sample.heat"), "utf8").split(/\r?\n/);
  const all = tokenize(grammar, sample);
  const bad = all.filter((t) => t.scopes.some((s) => s.startsWith("invalid.")));
  assert.deepEqual(bad, []);
  assertScope(all, "# LED downlight on a ceiling board".slice(1), "comment.line.number-sign.heat");
});

test("contextual declarations, new element kinds, digit segments of generated names", () => {
  const toks = tokenize(grammar, [
    "transient overnight (start = 17 h, duration = 15 h)",
    "use north_wall: wall(inside = shed_air, outside = yard)",
    "link glow: stove to panel radiation(emissivity = 0.9, area = pane)",
    "limit tip: temperature(fin.12.t) > 50 °C",
    "node case (fixed = 2 °C)",
  ]);
  assertScope(toks, "transient", "keyword.other.declaration.heat");
  assertScope(toks, "overnight", "entity.name.type.declaration.heat");
  assertScope(toks, "use", "keyword.other.declaration.heat");
  assertScope(toks, "radiation", "support.function.element.heat");
  assertScope(toks, "12", "variable.other.heat");
  const caseTok = scopesOf(toks, "case");
  assert.ok(!caseTok.includes("keyword.other.declaration.heat"), "a node named case is a name");
});
