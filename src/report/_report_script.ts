/**
 * The report's only script, inline and small: tables marked data-sortable sort when a
 * header button is pressed (numbers by their data-sort value, blanks last, a second press
 * reverses), and the inputs and selects marked data-filter-for hide the rows that do not
 * match (text anywhere in the row; a select against the row's data-<name> attribute).
 */
export const REPORT_SCRIPT = `
"use strict";
document.addEventListener("DOMContentLoaded", function () {
  var texts = new WeakMap();
  function key(cell) {
    if (!cell) return "";
    var s = cell.getAttribute("data-sort");
    return s === null ? cell.textContent.trim() : s;
  }
  function sortBy(table, col, th) {
    var numeric = th.getAttribute("data-type") === "num";
    var dir = th.getAttribute("aria-sort") === "ascending" ? -1 : 1;
    var heads = table.tHead.rows[0].cells;
    for (var h = 0; h < heads.length; h++) heads[h].removeAttribute("aria-sort");
    th.setAttribute("aria-sort", dir === 1 ? "ascending" : "descending");
    var body = table.tBodies[0];
    var rows = Array.prototype.map.call(body.rows, function (r, i) {
      return { r: r, i: i, k: key(r.cells[col]) };
    });
    rows.sort(function (a, b) {
      var ea = a.k === "", eb = b.k === "";
      if (ea || eb) return ea === eb ? a.i - b.i : ea ? 1 : -1;
      var c = numeric ? Number(a.k) - Number(b.k)
        : a.k.localeCompare(b.k, undefined, { numeric: true, sensitivity: "base" });
      return c * dir || a.i - b.i;
    });
    var frag = document.createDocumentFragment();
    rows.forEach(function (x) { frag.appendChild(x.r); });
    body.appendChild(frag);
  }
  function filter(table) {
    var controls = document.querySelectorAll('[data-filter-for="' + table.id + '"]');
    var text = "", attrs = [];
    Array.prototype.forEach.call(controls, function (c) {
      var v = c.value.trim().toLowerCase();
      var attr = c.getAttribute("data-filter-attr");
      if (attr) { if (v) attrs.push([attr, v]); } else text = v;
    });
    var rows = table.tBodies[0].rows, shown = 0;
    for (var i = 0; i < rows.length; i++) {
      var r = rows[i], t = texts.get(r);
      if (t === undefined) { t = r.textContent.toLowerCase(); texts.set(r, t); }
      var ok = (!text || t.indexOf(text) >= 0) && attrs.every(function (a) {
        return (r.getAttribute("data-" + a[0]) || "").toLowerCase() === a[1];
      });
      r.hidden = !ok;
      if (ok) shown++;
    }
    var out = document.querySelector('[data-count-for="' + table.id + '"]');
    if (out) out.textContent = shown + " of " + rows.length + " shown";
  }
  Array.prototype.forEach.call(document.querySelectorAll("table[data-sortable]"), function (table) {
    var heads = table.tHead.rows[0].cells;
    Array.prototype.forEach.call(heads, function (th, col) {
      var b = th.querySelector("button");
      if (b) b.addEventListener("click", function () { sortBy(table, col, th); });
    });
  });
  Array.prototype.forEach.call(document.querySelectorAll("[data-filter-for]"), function (c) {
    var table = document.getElementById(c.getAttribute("data-filter-for"));
    if (!table) return;
    c.addEventListener(c.tagName === "SELECT" ? "change" : "input", function () { filter(table); });
    filter(table);
  });
});
`;
