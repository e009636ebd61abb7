//! A self-contained listening page: one transport over several versions of a run.
//!
//! In: an [`AuditionPage`]: title, design summary, metrics, figure file names and
//! [`Track`]s (WAV files in the same folder, each with the level offset that matches
//! its loudness to the others). Out: `index.html` ([`render_page`], [`write_page`]),
//! one file with inline CSS and JavaScript: no network, no framework, no external
//! fonts, so it opens from the file system (`file://`) in any current browser.
//!
//! The page shows, in order: a listening-level caution, the transport (version
//! buttons, play/pause, position, master volume starting at −24 dB), the design
//! summary, the metrics table and the figures (`<img>` of the SVG files). Switching
//! version keeps the playback position and the play state. Keys: 1–9 choose a version,
//! space plays or pauses.
//!
//! Level matching: each version's `<audio>` element gets volume `master · 10^((o −
//! o_max)/20)` where `o` is its `level_offset_db` and `o_max` the largest offset, so
//! relative levels are exact and no volume exceeds 1 (the element's limit). Web Audio
//! gain nodes are not used: a page opened from `file://` is an opaque origin, and a
//! media element source fed from it plays silence (reference 3).
//!
//! Conventions: every text is HTML-escaped (reference 2); file names must be plain
//! names in the page's folder and are percent-encoded in `src` (reference 4); numbers
//! are written with fixed decimals, so equal pages give equal bytes. The active
//! version is exposed as `data-active` on `#listen` and as `aria-checked` on its
//! button. Opening `index.html#selfcheck` makes the script switch versions once and
//! write what it saw as JSON into `#selfcheck` (used by the browser test).
//!
//! # References
//! 1. WHATWG, "HTML Living Standard", section 4.8.11 (media elements: `currentTime`,
//!    `volume` in [0, 1], `paused`, `loadedmetadata`).
//! 2. WHATWG, "HTML Living Standard", section 13.1 (escaping text and attributes).
//! 3. W3C, "Web Audio API", section 1.21 (MediaElementAudioSourceNode: CORS-cross-
//!    origin media produces silence).
//! 4. IETF RFC 3986, "Uniform Resource Identifier (URI): Generic Syntax", 2005,
//!    section 2 (unreserved characters and percent-encoding).

use crate::atomic_file::AtomicFile;
use crate::error::{Error, Result};
use crate::markup::{escape, fixed};
use std::io::Write;
use std::path::Path;

/// The largest level offset accepted, in dB either way (±200 dB spans any audio format).
pub const MAX_LEVEL_OFFSET_DB: f64 = 200.0;

/// One version of the audio: input, float run, fixed run, residual.
#[derive(Debug, Clone, PartialEq)]
pub struct Track {
    /// Button text: `input`, `float`, `fixed`, `residual (+40 dB)`.
    pub label: String,
    /// WAV file name in the page's folder (no directories).
    pub file_name: String,
    /// Gain in dB the page applies so the versions play at matched level.
    pub level_offset_db: f64,
    /// Length in seconds, shown before the file's metadata has loaded.
    pub duration_s: f64,
}

/// Everything the listening page shows.
#[derive(Debug, Clone, PartialEq)]
pub struct AuditionPage {
    /// Page title and heading (design name, rate, number format).
    pub title: String,
    /// Lines describing the design, one list item each.
    pub summary_lines: Vec<String>,
    /// `(name, value)` rows of the metrics table, values already formatted with units.
    pub metrics: Vec<(String, String)>,
    /// SVG file names in the page's folder, shown in this order.
    pub figures: Vec<String>,
    /// The versions to switch between, at least one; keys 1–9 choose the first nine.
    pub tracks: Vec<Track>,
}

/// The page's file name inside its folder.
pub const PAGE_FILE: &str = "index.html";

/// Renders `page` as the text of `index.html`.
///
/// # Errors
/// [`Error::Input`] naming `index.html` and the track or figure when there is no
/// track, a file name is not a plain name in the page's folder (or is `index.html`),
/// a level offset is not finite or beyond ±200 dB, or a duration is negative or not
/// finite.
///
/// ```
/// use tonewright::audition::{render_page, AuditionPage, Track};
/// let track = |label: &str, offset| Track {
///     label: label.into(),
///     file_name: format!("{label}.wav"),
///     level_offset_db: offset,
///     duration_s: 2.0,
/// };
/// let page = AuditionPage {
///     title: "demo".into(),
///     summary_lines: vec![],
///     metrics: vec![],
///     figures: vec![],
///     tracks: vec![track("input", 0.0), track("fixed", -6.0)],
/// };
/// let html = render_page(&page)?;
/// // The quieter version's relative gain is 10^(-6/20) = 0.501187 (to 1e-6).
/// let at = html.find("fixed.wav\" data-gain=\"").unwrap() + 22;
/// let gain: f64 = html[at..at + 11].parse().unwrap();
/// assert!((gain - 0.501187).abs() < 1e-6);
/// # Ok::<(), tonewright::Error>(())
/// ```
pub fn render_page(page: &AuditionPage) -> Result<String> {
    check(page)?;
    let max_offset =
        page.tracks.iter().map(|t| t.level_offset_db).fold(f64::NEG_INFINITY, f64::max);
    let mut h = String::new();
    h.push_str("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n");
    h.push_str("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n");
    h.push_str(&format!("<title>{}</title>\n", escape(&page.title)));
    h.push_str(&format!("<script>\n{}</script>\n", include_str!("errors.js")));
    h.push_str(&format!(
        "<style>\n{}</style>\n</head>\n<body>\n<main>\n",
        include_str!("page.css")
    ));
    h.push_str(&format!("<h1>{}</h1>\n", escape(&page.title)));
    h.push_str(
        "<p class=\"caution\" role=\"note\"><strong>Listening level.</strong> Start playback \
         quietly and raise the volume slowly. Resonant, high-gain or unstable filters can \
         produce full-scale tones without warning; protect your hearing and your \
         speakers.</p>\n",
    );
    listen_section(&mut h, &page.tracks, max_offset);
    if !page.summary_lines.is_empty() {
        h.push_str("<h2>design</h2>\n<ul class=\"summary\">\n");
        for line in &page.summary_lines {
            h.push_str(&format!("<li>{}</li>\n", escape(line)));
        }
        h.push_str("</ul>\n");
    }
    if !page.metrics.is_empty() {
        h.push_str("<h2>metrics</h2>\n<table class=\"metrics\">\n");
        for (name, value) in &page.metrics {
            h.push_str(&format!(
                "<tr><th scope=\"row\">{}</th><td>{}</td></tr>\n",
                escape(name),
                escape(value)
            ));
        }
        h.push_str("</table>\n");
    }
    if !page.figures.is_empty() {
        h.push_str("<h2>figures</h2>\n");
        for name in &page.figures {
            h.push_str(&format!(
                "<figure><img src=\"{}\" alt=\"{n}\"><figcaption>{n}</figcaption></figure>\n",
                escape(&percent_encode(name)),
                n = escape(name)
            ));
        }
    }
    h.push_str("<pre id=\"selfcheck\" hidden></pre>\n</main>\n");
    h.push_str(&format!("<script>\n{}</script>\n</body>\n</html>\n", include_str!("page.js")));
    Ok(h)
}

/// Writes `index.html` for `page` into `dir` through [`AtomicFile`].
///
/// # Errors
/// The errors of [`render_page`], with the page's path; [`Error::Io`] naming the path
/// when it cannot be written.
pub fn write_page(dir: &Path, page: &AuditionPage) -> Result<()> {
    let path = dir.join(PAGE_FILE);
    let html = render_page(page).map_err(|e| match e {
        Error::Input(message) => {
            Error::input(message.replacen(PAGE_FILE, &path.display().to_string(), 1))
        }
        other => other,
    })?;
    let mut file = AtomicFile::create(&path, &[])?;
    file.write_all(html.as_bytes()).map_err(|e| Error::io(&path, e))?;
    file.commit()
}

fn listen_section(h: &mut String, tracks: &[Track], max_offset: f64) {
    h.push_str(
        "<section id=\"listen\" class=\"card\" data-active=\"0\">\n\
         <div class=\"versions\" role=\"radiogroup\" aria-label=\"version\">\n",
    );
    for (i, track) in tracks.iter().enumerate() {
        let key = if i < 9 { format!("{}", i + 1) } else { String::new() };
        h.push_str(&format!(
            "<button type=\"button\" role=\"radio\" aria-checked=\"{}\">\
             <span class=\"key\">{key}</span>{}<span class=\"level\">{} dB</span></button>\n",
            i == 0,
            escape(&track.label),
            signed_db(track.level_offset_db)
        ));
    }
    h.push_str(
        "</div>\n<div class=\"transport\">\n\
         <button type=\"button\" id=\"play\" aria-label=\"play\">play</button>\n",
    );
    h.push_str(
        "<input type=\"range\" id=\"position\" min=\"0\" max=\"1000\" step=\"1\" value=\"0\" \
         aria-label=\"position\">\n",
    );
    h.push_str(&format!(
        "<span id=\"time\">0:00.000 / {}</span>\n</div>\n",
        clock(tracks[0].duration_s)
    ));
    h.push_str(
        "<label class=\"volume\">volume <input type=\"range\" id=\"volume\" min=\"-60\" max=\"0\" \
         step=\"1\" value=\"-24\"> <output id=\"volume-db\">-24 dB</output></label>\n",
    );
    h.push_str(
        "<p class=\"hint\">Switching version keeps the position; each version plays at the level \
         offset shown, so they compare at matched loudness. Keys: 1–9 choose a version, space \
         plays or pauses.</p>\n",
    );
    for track in tracks {
        let gain = 10f64.powf((track.level_offset_db - max_offset) / 20.0);
        h.push_str(&format!(
            "<audio preload=\"auto\" src=\"{}\" data-gain=\"{}\" data-duration=\"{}\"></audio>\n",
            escape(&percent_encode(&track.file_name)),
            fixed(gain, 9),
            fixed(track.duration_s, 6)
        ));
    }
    h.push_str("</section>\n");
}

/// `+3.0`, `-6.0`, `0.0`: an offset with its sign.
fn signed_db(db: f64) -> String {
    let text = fixed(db, 1);
    if db > 0.0 && text != "0.0" {
        format!("+{text}")
    } else {
        text
    }
}

/// `m:ss.mmm`.
fn clock(seconds: f64) -> String {
    let millis = (seconds * 1000.0).round() as u64;
    format!("{}:{:02}.{:03}", millis / 60_000, millis / 1000 % 60, millis % 1000)
}

/// `name` with every byte outside RFC 3986's unreserved set percent-encoded.
fn percent_encode(name: &str) -> String {
    name.bytes()
        .map(|b| match b {
            b'A'..=b'Z' | b'a'..=b'z' | b'0'..=b'9' | b'-' | b'.' | b'_' | b'~' => {
                char::from(b).to_string()
            }
            _ => format!("%{b:02X}"),
        })
        .collect()
}

fn check(page: &AuditionPage) -> Result<()> {
    let bad = |what: String| Error::input(format!("{PAGE_FILE}: {what}"));
    if page.tracks.is_empty() {
        return Err(bad("a listening page needs at least one track".into()));
    }
    for (i, track) in page.tracks.iter().enumerate() {
        let place = format!("track {} \"{}\"", i + 1, track.label);
        check_name(&track.file_name)
            .map_err(|why| bad(format!("{place}: file name \"{}\" {why}", track.file_name)))?;
        let offset = track.level_offset_db;
        if !(offset.is_finite() && offset.abs() <= MAX_LEVEL_OFFSET_DB) {
            return Err(bad(format!(
                "{place}: level offset {offset} dB must be finite and within \
                 ±{MAX_LEVEL_OFFSET_DB} dB"
            )));
        }
        if !(track.duration_s.is_finite() && track.duration_s >= 0.0) {
            return Err(bad(format!(
                "{place}: duration {} s must be finite and at least 0",
                track.duration_s
            )));
        }
    }
    for name in &page.figures {
        check_name(name).map_err(|why| bad(format!("figure file name \"{name}\" {why}")))?;
    }
    Ok(())
}

/// Why `name` is not a plain file name beside the page, if it is not.
fn check_name(name: &str) -> std::result::Result<(), &'static str> {
    if name.is_empty() || name == "." || name == ".." {
        Err("must name a file")
    } else if name.contains(['/', '\\']) || name.chars().any(char::is_control) {
        Err("must be a plain name in the page's folder (no directories or control characters)")
    } else if name == PAGE_FILE {
        Err("is the page itself")
    } else {
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn page() -> AuditionPage {
        AuditionPage {
            title: "tone <lp> & \"notch\"".into(),
            summary_lines: vec![
                "2 sections, prewarped at 1 kHz".into(),
                "<script>alert(1)</script>".into(),
            ],
            metrics: vec![("snr fixed vs float".into(), "92.4 dB".into())],
            figures: vec!["magnitude.svg".into(), "z plane#1.svg".into()],
            tracks: vec![
                Track {
                    label: "input".into(),
                    file_name: "input.wav".into(),
                    level_offset_db: 0.0,
                    duration_s: 1.5,
                },
                Track {
                    label: "residual (+40 dB)".into(),
                    file_name: "residual.wav".into(),
                    level_offset_db: 40.0,
                    duration_s: 1.5,
                },
            ],
        }
    }

    #[test]
    fn every_text_is_escaped() {
        let html = render_page(&page()).unwrap();
        assert!(html.contains("<title>tone &lt;lp&gt; &amp; &quot;notch&quot;</title>"));
        assert!(html.contains("<li>&lt;script&gt;alert(1)&lt;/script&gt;</li>"));
        assert!(!html.contains("alert(1)</script>"));
    }

    #[test]
    fn file_names_are_percent_encoded_in_src() {
        let html = render_page(&page()).unwrap();
        assert!(html.contains("src=\"z%20plane%231.svg\""), "{html}");
    }

    #[test]
    fn equal_pages_give_equal_bytes() {
        assert_eq!(render_page(&page()).unwrap(), render_page(&page().clone()).unwrap());
    }

    #[test]
    fn gains_are_relative_to_the_loudest_offset() {
        let html = render_page(&page()).unwrap();
        assert!(html.contains("data-gain=\"0.010000000\""), "input is 40 dB below the residual");
        assert!(html.contains("data-gain=\"1.000000000\""));
        assert!(html.contains("+40.0 dB"));
    }

    #[test]
    fn bad_tracks_are_errors_naming_the_page_and_track() {
        let mut p = page();
        p.tracks[1].file_name = "../secret.wav".into();
        let err = render_page(&p).unwrap_err().to_string();
        assert!(err.starts_with("index.html: track 2 \"residual (+40 dB)\""), "{err}");
        let mut p = page();
        p.tracks[0].level_offset_db = f64::NAN;
        assert!(render_page(&p).unwrap_err().to_string().contains("level offset NaN dB"));
        let mut p = page();
        p.tracks.clear();
        assert!(render_page(&p).is_err());
        let mut p = page();
        p.figures.push("index.html".into());
        assert!(render_page(&p).unwrap_err().to_string().contains("the page itself"));
    }

    #[test]
    fn write_page_names_the_written_path_in_errors() {
        let mut p = page();
        p.tracks[0].duration_s = -1.0;
        let dir = std::env::temp_dir();
        let err = write_page(&dir, &p).unwrap_err().to_string();
        assert!(err.starts_with(&dir.join("index.html").display().to_string()), "{err}");
    }

    #[test]
    fn clock_shows_minutes_seconds_and_milliseconds() {
        assert_eq!(clock(61.2345), "1:01.235");
        assert_eq!(clock(0.5), "0:00.500");
    }
}
