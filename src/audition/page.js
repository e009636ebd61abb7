// One transport over several versions of the same audio. Every version is its own
// <audio> element; only the active one plays. Switching copies the position to the
// chosen element and starts it if the previous one was playing.
//
// Level matching uses the media element's volume, not Web Audio: a page opened from
// file:// is an opaque origin in current browsers, and a MediaElementAudioSourceNode
// fed by it outputs silence, whereas element volume works everywhere. Volume cannot
// exceed 1, so each version's gain is relative to the loudest offset (data-gain <= 1)
// and the master slider scales them all.
(function () {
  "use strict";
  var listen = document.getElementById("listen");
  var audios = Array.prototype.slice.call(listen.querySelectorAll("audio"));
  var buttons = Array.prototype.slice.call(listen.querySelectorAll(".versions button"));
  var play = document.getElementById("play");
  var position = document.getElementById("position");
  var time = document.getElementById("time");
  var volume = document.getElementById("volume");
  var volumeDb = document.getElementById("volume-db");
  var active = 0;
  var dragging = false;

  function clock(s) {
    if (!isFinite(s)) { s = 0; }
    var m = Math.floor(s / 60);
    var rest = (s - 60 * m).toFixed(3);
    return m + ":" + (rest < 10 ? "0" : "") + rest;
  }
  function master() { return Math.pow(10, Number(volume.value) / 20); }
  function applyVolume(a) { a.volume = Math.min(1, Math.max(0, master() * Number(a.dataset.gain))); }
  function current() { return audios[active]; }
  function show() {
    var a = current();
    var d = isFinite(a.duration) ? a.duration : Number(a.dataset.duration);
    if (!dragging) { position.value = d > 0 ? String(Math.round(1000 * a.currentTime / d)) : "0"; }
    time.textContent = clock(a.currentTime) + " / " + clock(d);
    play.textContent = a.paused ? "play" : "pause";
    play.setAttribute("aria-label", a.paused ? "play" : "pause");
  }
  function report(err) { if (err && err.name !== "AbortError") { console.error("playback: " + err.name); } }
  function start(a) {
    audios.forEach(function (other) { if (other !== a) { other.pause(); } });
    applyVolume(a);
    var p = a.play();
    if (p && p.catch) { p.catch(report); }
  }
  function select(i) {
    if (i === active || i < 0 || i >= audios.length) { return; }
    var from = current();
    var to = audios[i];
    var wasPlaying = !from.paused;
    var t = from.currentTime;
    from.pause();
    to.currentTime = isFinite(to.duration) ? Math.min(t, to.duration) : t;
    active = i;
    listen.dataset.active = String(i);
    buttons.forEach(function (b, k) { b.setAttribute("aria-checked", k === i ? "true" : "false"); });
    applyVolume(to);
    if (wasPlaying) { start(to); }
    show();
  }
  function toggle() {
    var a = current();
    if (a.paused) { start(a); } else { a.pause(); }
    show();
  }

  buttons.forEach(function (b, i) { b.addEventListener("click", function () { select(i); }); });
  play.addEventListener("click", toggle);
  position.addEventListener("input", function () { dragging = true; });
  position.addEventListener("change", function () {
    var a = current();
    var d = isFinite(a.duration) ? a.duration : 0;
    a.currentTime = d * Number(position.value) / 1000;
    dragging = false;
    show();
  });
  volume.addEventListener("input", function () {
    volumeDb.textContent = volume.value + " dB";
    audios.forEach(applyVolume);
  });
  audios.forEach(function (a) {
    ["timeupdate", "play", "pause", "ended", "loadedmetadata", "seeked"].forEach(function (e) {
      a.addEventListener(e, show);
    });
    a.addEventListener("error", function () { console.error("cannot load " + a.getAttribute("src")); });
  });
  document.addEventListener("keydown", function (e) {
    var tag = e.target && e.target.tagName;
    if (e.key >= "1" && e.key <= "9") {
      select(Number(e.key) - 1);
    } else if (e.key === " " && tag !== "BUTTON" && tag !== "INPUT") {
      e.preventDefault();
      toggle();
    }
  });
  audios.forEach(applyVolume);
  show();

  // Self-check, only when the page is opened as index.html#selfcheck (used by the
  // browser test): waits for every element's metadata, switches from the first to the
  // second version while "playing", and writes what it saw as JSON into #selfcheck.
  if (location.hash !== "#selfcheck") { return; }
  var pending = audios.length;
  function settled() {
    pending -= 1;
    if (pending > 0) { return; }
    var seen = { durations: audios.map(function (a) { return a.duration; }) };
    var a = current();
    a.currentTime = Math.min(0.25, a.duration / 2);
    seen.positionBefore = a.currentTime;
    seen.activeBefore = active;
    start(a);
    select(audios.length > 1 ? 1 : 0);
    seen.activeAfter = active;
    seen.dataActive = listen.dataset.active;
    seen.playing = audios.map(function (x) { return !x.paused; });
    seen.positionAfter = current().currentTime;
    seen.volumes = audios.map(function (x) { return x.volume; });
    audios.forEach(function (x) { x.pause(); });
    seen.errors = window.pageErrors;
    var out = document.getElementById("selfcheck");
    out.textContent = JSON.stringify(seen);
    out.dataset.done = "true";
  }
  audios.forEach(function (a) {
    if (a.readyState >= 1 || a.error) { settled(); return; }
    var once = function () {
      a.removeEventListener("loadedmetadata", once);
      a.removeEventListener("error", once);
      settled();
    };
    a.addEventListener("loadedmetadata", once);
    a.addEventListener("error", once);
  });
})();
