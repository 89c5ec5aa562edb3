/* Sort and filter the materials table. The table is complete HTML without this script. */
(function () {
  "use strict";
  var table = document.getElementById("materials");
  if (!table) { return; }
  var body = table.tBodies[0];
  var rows = Array.prototype.slice.call(body.rows);
  var controls = document.getElementById("table-controls");
  var count = document.getElementById("table-count");
  controls.hidden = false;

  var filters = Array.prototype.slice.call(controls.querySelectorAll("select[data-filter]"));
  var text = controls.querySelector("input[data-filter-text]");

  // "any text in the row": what the row shows (force, category, stores ...) plus what it
  // leaves out (synonyms, CAS RN, InChIKey, store keys) from data-q
  var haystacks = rows.map(function (row) {
    return (row.getAttribute("data-q") + " " + row.textContent).replace(/\s+/g, " ").toLowerCase();
  });

  function apply() {
    var q = (text.value || "").trim().replace(/\s+/g, " ").toLowerCase();
    var shown = 0;
    rows.forEach(function (row, i) {
      var ok = !q || haystacks[i].indexOf(q) !== -1;
      filters.forEach(function (sel) {
        var want = sel.value;
        if (!want) { return; }
        var have = (row.getAttribute("data-" + sel.getAttribute("data-filter")) || "").split(" ");
        if (have.indexOf(want) === -1) { ok = false; }
      });
      row.hidden = !ok;
      if (ok) { shown += 1; }
    });
    count.textContent = shown + " of " + rows.length + " materials shown";
  }
  filters.forEach(function (sel) { sel.addEventListener("change", apply); });
  text.addEventListener("input", apply);

  var headers = Array.prototype.slice.call(table.tHead.rows[0].cells);
  headers.forEach(function (th, col) {
    var button = th.querySelector("button");
    if (!button) { return; }
    button.addEventListener("click", function () {
      var ascending = th.getAttribute("aria-sort") !== "ascending";
      headers.forEach(function (h) { h.removeAttribute("aria-sort"); });
      th.setAttribute("aria-sort", ascending ? "ascending" : "descending");
      var numeric = th.getAttribute("data-type") === "number";
      rows.sort(function (a, b) {
        var va = a.cells[col].getAttribute("data-sort"), vb = b.cells[col].getAttribute("data-sort");
        var blankA = va === null || va === "", blankB = vb === null || vb === "";
        if (blankA || blankB) { return blankA === blankB ? 0 : (blankA ? 1 : -1); }
        var cmp = numeric ? parseFloat(va) - parseFloat(vb) : va.localeCompare(vb);
        return ascending ? cmp : -cmp;
      });
      rows.forEach(function (row) { body.appendChild(row); });
    });
  });
  apply();
})();
