// Runs first: keeps every script error, failed resource load, rejected promise and
// console.error so the self-check can report them (window.pageErrors).
window.pageErrors = [];
window.addEventListener("error", function (e) {
  var t = e.target;
  window.pageErrors.push(e.message ? String(e.message) : "cannot load " + (t && (t.src || t.currentSrc) || "a resource"));
}, true);
window.addEventListener("unhandledrejection", function (e) { window.pageErrors.push("unhandled rejection: " + String(e.reason)); });
(function () {
  var original = console.error;
  console.error = function () {
    window.pageErrors.push(Array.prototype.map.call(arguments, String).join(" "));
    return original.apply(console, arguments);
  };
})();
