// The Groups card: the engine's groups section (report.groups) as a
// sentence, a table per group, the tests, the pairs and the chart. Only
// what the engine reports is shown; nothing is computed here.
import { state, actions } from "./state.js";
import { fmt, fmtP, pct, unit, el, num, helpLinks, table, missing, methodName } from "./dom.js";
import { addCard, card, chartFigure } from "./card-kit.js";

const LINKS = [["groups", "groups"], ["anova", "ANOVA and Welch's ANOVA"], ["kruskal-wallis", "Kruskal-Wallis"],
  ["two-groups", "two groups"], ["spread-tests", "spread tests"], ["pairwise", "pairwise comparisons"], ["letters", "letters"]];

function range(ci, extra) {
  if (!ci) return "\u2013";
  return [num(ci.lo, extra), " to ", num(ci.hi, extra)];
}

function testTable(tests) {
  return table(["Test", "Statistic", "df", "p", "Note"], tests.map((t) => [
    t.lead ? el("strong", { text: t.name + " (leads)" }) : t.name,
    el("span", { class: "num", "data-field": "groups-test-" + t.code, "data-value": String(t.statistic), text: fmt(t.statistic, 3) }),
    t.df !== undefined && t.df !== null ? (t.df2 !== undefined && t.df2 !== null ? fmt(t.df, 0) + ", " + fmt(t.df2, 0) : fmt(t.df, 0)) : "\u2013",
    el("span", { class: "num", "data-field": "groups-p-" + t.code, "data-value": String(t.p), text: fmtP(t.p) }),
    t.method || ""]), "figs groups-tests");
}

function pairTable(set) {
  const share = (p) => p.ofTolerance !== undefined && p.ofTolerance !== null;
  const anyTol = set.pairs.some(share);
  const head = ["Pair (B \u2212 A)", "Difference", "Interval", "p (adjusted)", "Differ"];
  if (anyTol) head.push("Of tolerance");
  return table(head, set.pairs.map((p) => {
    const row = [p.b + " \u2212 " + p.a, p.diff !== undefined && p.diff !== null ? num(p.diff, 1) : "\u2013", range(p.ci, 1), fmtP(p.p), p.differ ? "yes" : "no"];
    if (anyTol) row.push(share(p) ? (Math.round(p.ofTolerance * 1000) / 10) + " %" : "\u2013");
    return row;
  }), "figs groups-pairs");
}

function levelTable(g) {
  const specs = g.levels.some((l) => l.spec);
  const head = ["Group", "n", "Quote", "Centre", "Interval", "Spread", "Suspects", "Letters"];
  if (specs) head.push("Outside spec", "Cpk, within (interval)", "Ppk, overall (interval)");
  return table(head, g.levels.map((l, i) => {
    const med = l.quote === "median-iqr";
    const row = [l.title, String(l.n), l.n ? (med ? "median, IQR" : "mean, SD") : "\u2013",
      l.n ? num(med ? l.median : l.mean, med ? 1 : 2, "groups-centre-" + i) : "\u2013",
      range(med ? l.medianCI : l.meanCI, med ? 1 : 2),
      l.n ? num(med ? l.iqr : l.sd, med ? 1 : 2) : "\u2013",
      l.suspectCount ? l.suspects.map((s) => "row " + s.row + " (" + s.text + ")").join(", ") + (l.suspectCount > l.suspects.length ? " and " + (l.suspectCount - l.suspects.length) + " more" : "") : "none",
      l.inTests ? (l.letters || "\u2013") : "left out: " + (l.leftOut || "")];
    if (specs) {
      const s = l.spec;
      const index = (v, ci) => v !== undefined && v !== null
        ? [el("span", { text: (Math.round(v * 100) / 100).toFixed(2) + " " }), ci ? "(" + ci.lo.toFixed(2) + " to " + ci.hi.toFixed(2) + ")" : ""]
        : "\u2013";
      row.push(s ? (Math.round(s.outside * 1000) / 10) + " % (" + (s.below + s.above) + ")" : "\u2013",
        s ? index(s.cpk, s.cpkCI) : "\u2013", s ? index(s.ppk, s.ppkCI) : "\u2013");
    }
    return row;
  }), "figs groups-levels");
}

// sideBySide offers the numeric columns to compare as groups when the data
// hold one column per group ("wide"); the choice travels as state.cols.groups.
function sideBySide(rep) {
  const cols = ((rep.input && rep.input.columns) || []).filter((c) => c.numbers > 0 && c.kind === "number");
  if (cols.length < 2) return null;
  const on = new Set(state.cols.groups || []);
  const boxes = cols.map((c) => el("label", { class: "inline" },
    el("input", { type: "checkbox", name: "groups-wide", value: c.name, checked: on.has(c.name) }), " " + c.name + " "));
  const go = () => {
    const picked = Array.from(document.querySelectorAll('input[name="groups-wide"]:checked')).map((b) => b.value);
    state.cols.groups = picked.length >= 2 ? picked : [];
    if (state.cols.groups.length) { state.cols.group = ""; const s = document.getElementById("col-group"); if (s) s.value = ""; }
    actions.analyse();
  };
  return el("fieldset", { class: "groups-wide" }, el("legend", { text: "Or compare columns side by side (one column per group)" }), ...boxes,
    el("button", { type: "button", class: "small", id: "groups-wide-go", text: on.size ? "Compare these columns" : "Compare side by side", onclick: go }),
    on.size ? el("button", { type: "button", class: "small", text: "Stop comparing columns", onclick: () => { state.cols.groups = []; actions.analyse(); } }) : null);
}

function groupsCard(rep) {
  const g = rep.groups;
  if (!g) {
    if (state.cols.group) return card("groups", "Groups", missing("groups", "The comparison of groups"), helpLinks(LINKS));
    return card("groups placeholder", "Groups",
      el("p", { class: "needs", text: (rep.input.columns || []).length > 1
        ? "To compare lines, shifts or suppliers, choose a group column under Columns, or tick columns side by side below."
        : "To compare lines, shifts or suppliers, paste or drop data with a column that names the group of each reading (or one column per group)." }),
      sideBySide(rep), helpLinks(LINKS));
  }
  const kids = [];
  kids.push(el("p", { class: "lead groups-statement", "data-field": "groups-statement", text: g.statement }));
  kids.push(el("p", { class: "basis", text: g.shape === "wide"
    ? "Groups from " + g.levels.length + " columns side by side: " + (g.columns || []).join(", ") + "."
    : g.levels.length + " groups from column \u201c" + g.column + "\u201d." }));
  if (g.reasons && g.reasons.length) kids.push(el("details", null,
    el("summary", { text: g.lead === "medians" ? "Why the rank tests lead" : "Why the tests of means lead" }),
    el("ul", { class: "reasons" }, ...g.reasons.map((r) => el("li", { "data-code": r.code, text: r.text })))));
  kids.push(chartFigure("groups", "Each group on one scale: box plot above its readings, the centre with its interval below the box; suspect readings circled and labelled by row; letters beside the names."));
  kids.push(levelTable(g));
  if (g.effect) {
    const e = g.effect, rows = [["Difference in means (" + e.b + " \u2212 " + e.a + ")", [num(e.meanDiff, 2, "groups-mean-diff")].concat(unit() ? [" " + unit()] : [])],
      ["  interval", range(e.meanDiffCI, 2)]];
    if (e.shift !== undefined && e.shift !== null) rows.push(["Hodges-Lehmann shift", num(e.shift, 1, "groups-shift")], ["  interval", range(e.shiftCI, 1)]);
    if (e.hedgesG !== undefined && e.hedgesG !== null) rows.push(["Hedges' g (in pooled SDs)", e.hedgesG.toFixed(2)]);
    if (e.ofTolerance !== undefined && e.ofTolerance !== null) rows.push(["Share of the tolerance", (Math.round(e.ofTolerance * 1000) / 10) + " %"]);
    kids.push(el("details", { open: "" }, el("summary", { text: "How far apart" }), table(["Figure", "Value"], rows, "figs kv")));
  }
  if (g.centre) kids.push(el("details", null, el("summary", { text: "Tests of a difference in centre" }),
    el("p", { class: "why", text: g.centre.why }), testTable(g.centre.tests)));
  else kids.push(missing("groups.centre", "The tests of a difference in centre"));
  if (g.spread) kids.push(el("details", null, el("summary", { text: "Tests of a difference in spread" }),
    el("p", { class: "why", text: g.spread.why + " Largest SD / smallest SD: " + g.spread.ratio.toFixed(2) + " (" + g.spread.largest + " / " + g.spread.smallest + ")" +
      (g.spread.ratioCI ? ", " + pct(g.spread.ratioCI.level) + " interval " + g.spread.ratioCI.lo.toFixed(2) + " to " + g.spread.ratioCI.hi.toFixed(2) : "") + "." }),
    testTable(g.spread.tests)));
  const pw = g.pairwise;
  if (pw) for (const [key, set] of [["means", pw.means], ["medians", pw.medians]]) {
    if (!set) continue;
    kids.push(el("details", null, el("summary", { text: "Pairs, " + key + ": " + methodName(set.method) + (set.lead ? " (gives the letters)" : "") }),
      el("p", { class: "why", text: set.why }), pairTable(set)));
  }
  if (g.shape === "wide") kids.push(sideBySide(rep));
  kids.push(helpLinks(LINKS));
  return card("groups", "Groups", ...kids);
}

addCard("groups", groupsCard);
