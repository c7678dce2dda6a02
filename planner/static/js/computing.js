// Shows "Computing…" while the browser waits for the next page, so a long
// prediction does not look like a dead button.  Any form marked
// data-computing gets it.  The print button lives here too: one small script
// per page.
(function () {
  "use strict";
  document.querySelectorAll("form[data-computing]").forEach(function (form) {
    var note = form.querySelector(".computing");
    var button = form.querySelector("button[type=submit]");
    if (!note || !button) { return; }
    form.addEventListener("submit", function () {
      note.hidden = false;
      button.disabled = true;
      document.body.classList.add("is-computing");
    });
    // Coming back with the browser's Back button restores the page from its
    // cache with the note still showing; reset it.
    window.addEventListener("pageshow", function () {
      note.hidden = true;
      button.disabled = false;
      document.body.classList.remove("is-computing");
    });
  });
  var printButton = document.getElementById("print-button");
  if (printButton) {
    printButton.addEventListener("click", function () { window.print(); });
  }
})();
