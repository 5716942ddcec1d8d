// Progressive help only: reads a chosen CSV file into the upload form's
// text box. Without JavaScript the box is filled by pasting.
"use strict";
document.addEventListener("DOMContentLoaded", function () {
  document.querySelectorAll("input[type=file][data-into]").forEach(function (input) {
    var target = document.getElementById(input.getAttribute("data-into"));
    var pick = document.querySelector("label.file-pick[for='" + input.id + "']");
    if (!target || !window.FileReader) { return; }
    input.hidden = false;
    if (pick) { pick.hidden = false; }
    input.addEventListener("change", function () {
      var file = input.files && input.files[0];
      if (!file || file.size > 1048576) { return; }
      var reader = new FileReader();
      reader.onload = function () { target.value = String(reader.result); };
      reader.readAsText(file);
    });
  });
});
