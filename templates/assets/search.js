/* Find a material as you type, with no server: the index is a script file
   (search-index.js sets window.COHESION_INDEX), so it also works under file://. */
(function () {
  "use strict";
  var form = document.getElementById("site-search");
  var index = window.COHESION_INDEX || [];
  if (!form) { return; }
  var input = form.querySelector("input");
  var list = document.getElementById("search-results");
  var status = document.getElementById("search-status");
  var root = document.documentElement.getAttribute("data-root") || "";
  form.hidden = false;
  form.addEventListener("submit", function (ev) {
    ev.preventDefault();
    var first = list.querySelector("a");
    if (first) { window.location.href = first.getAttribute("href"); }
  });

  function fold(text) {
    return (text || "").toLowerCase().normalize("NFKD").replace(/[\u0300-\u036f]/g, "");
  }
  index.forEach(function (item) {
    item._haystack = fold([item.name, item.code, item.cas, item.formula, item.inchikey]
      .concat(item.synonyms || []).join(" \u0001 "));
  });

  function matchedField(item, q) {
    var fields = [["name", item.name], ["code", item.code], ["CAS", item.cas], ["formula", item.formula],
                  ["InChIKey", item.inchikey]];
    (item.synonyms || []).forEach(function (s) { fields.push(["synonym", s]); });
    for (var i = 0; i < fields.length; i++) {
      if (fields[i][1] && fold(fields[i][1]).indexOf(q) !== -1) { return fields[i]; }
    }
    return null;
  }

  function show() {
    var q = fold(input.value.trim());
    list.textContent = "";
    if (!q) { status.textContent = ""; return; }
    var hits = index.filter(function (item) { return item._haystack.indexOf(q) !== -1; });
    hits.sort(function (a, b) {
      var pa = fold(a.name).indexOf(q) === 0 ? 0 : 1, pb = fold(b.name).indexOf(q) === 0 ? 0 : 1;
      return pa - pb || a.name.localeCompare(b.name);
    });
    hits.slice(0, 12).forEach(function (item) {
      var li = document.createElement("li");
      var a = document.createElement("a");
      a.href = root + item.url;
      a.textContent = item.name;
      li.appendChild(a);
      var why = matchedField(item, q);
      if (why && why[0] !== "name") {
        var small = document.createElement("span");
        small.className = "hit-why";
        small.textContent = " " + why[0] + ": " + why[1];
        li.appendChild(small);
      }
      list.appendChild(li);
    });
    status.textContent = hits.length === 1 ? "1 material found" : hits.length + " materials found";
  }
  input.addEventListener("input", show);
  document.addEventListener("keydown", function (ev) {
    if (ev.key === "/" && document.activeElement !== input && !/INPUT|SELECT|TEXTAREA/.test(document.activeElement.tagName)) {
      ev.preventDefault();
      input.focus();
    }
  });
})();
