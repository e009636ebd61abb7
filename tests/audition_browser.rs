//! The listening page in a real browser: headless Debian chromium loads it from the
//! file system, its self-check (`index.html#selfcheck`) reports durations, errors and
//! the effect of switching versions, and a screenshot shows a rendered page.
//!
//! Needs the Debian package `chromium` (binary `chromium`; `TONEWRIGHT_CHROMIUM`
//! overrides the path). Without it the test prints `SKIPPED: no chromium` and passes.

use std::path::{Path, PathBuf};
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};
use tonewright::audio::signal::{sine, SignalSpec};
use tonewright::audio::{SampleFormat, WavSpec, WavWriter};
use tonewright::audition::{write_page, AuditionPage, Track};
use tonewright::plot::{frequency_svg, write_svg, Curve, CurveStyle, FrequencyFigure};

/// Each browser run is cut off after this long.
const BROWSER_TIMEOUT: Duration = Duration::from_secs(90);
const RATE: u32 = 48000;

fn find_chromium() -> Option<PathBuf> {
    if let Some(path) = std::env::var_os("TONEWRIGHT_CHROMIUM") {
        return Some(PathBuf::from(path));
    }
    let dirs = std::env::var_os("PATH")?;
    std::env::split_paths(&dirs)
        .flat_map(|dir| ["chromium", "chromium-browser"].map(|name| dir.join(name)))
        .find(|candidate| candidate.is_file())
}

fn write_sine(path: &Path, seconds: f64, freq_hz: f64) {
    let spec = SignalSpec { rate: RATE, channels: 1, seconds, level_dbfs: -20.0 };
    let samples = sine(&spec, freq_hz).unwrap();
    let wav = WavSpec { channels: 1, rate: RATE, sample: SampleFormat::Int { bits: 16 } };
    let mut writer = WavWriter::create(path, wav, &[]).unwrap();
    writer.write_block(&samples).unwrap();
    writer.finish().unwrap();
}

/// Runs chromium headless with `extra` arguments on `url`; returns stdout.
fn run_chromium(chromium: &Path, work: &Path, extra: &[String], url: &str) -> String {
    let stdout_path = work.join("stdout.txt");
    let stderr_path = work.join("stderr.txt");
    let mut child = Command::new(chromium)
        .args([
            "--headless",
            "--no-sandbox",
            "--disable-gpu",
            "--disable-background-networking",
            "--disable-component-update",
            "--disable-sync",
            "--no-first-run",
            "--mute-audio",
            "--allow-file-access-from-files",
            "--autoplay-policy=no-user-gesture-required",
            "--virtual-time-budget=5000",
        ])
        .arg(format!("--user-data-dir={}", work.join("profile").display()))
        .args(extra)
        .arg(url)
        .stdin(Stdio::null())
        .stdout(std::fs::File::create(&stdout_path).unwrap())
        .stderr(std::fs::File::create(&stderr_path).unwrap())
        .spawn()
        .expect("chromium starts");
    let started = Instant::now();
    loop {
        if let Some(status) = child.try_wait().unwrap() {
            let stderr = std::fs::read_to_string(&stderr_path).unwrap_or_default();
            assert!(status.success(), "chromium failed ({status}):\n{stderr}");
            return std::fs::read_to_string(&stdout_path).unwrap();
        }
        if started.elapsed() > BROWSER_TIMEOUT {
            let _ = child.kill();
            let _ = child.wait();
            panic!("chromium did not finish within {BROWSER_TIMEOUT:?}");
        }
        std::thread::sleep(Duration::from_millis(50));
    }
}

/// The JSON text of `<pre id="selfcheck" …>…</pre>` in a serialized DOM.
fn selfcheck_json(dom: &str) -> serde_json::Value {
    let start = dom.find("id=\"selfcheck\"").expect("#selfcheck in the dom");
    let open_end = start + dom[start..].find('>').unwrap() + 1;
    let close = open_end + dom[open_end..].find("</pre>").unwrap();
    let text = dom[open_end..close]
        .replace("&lt;", "<")
        .replace("&gt;", ">")
        .replace("&quot;", "\"")
        .replace("&amp;", "&");
    assert!(!text.is_empty(), "the self-check did not finish:\n{dom}");
    serde_json::from_str(&text).expect("self-check writes json")
}

/// Distinct RGB colours and the share of the most common one in an 8-bit RGB(A) PNG.
fn colour_variety(path: &Path) -> (usize, f64) {
    let decoder = png::Decoder::new(std::io::BufReader::new(std::fs::File::open(path).unwrap()));
    let mut reader = decoder.read_info().unwrap();
    let mut buf = vec![0; reader.output_buffer_size().unwrap()];
    let info = reader.next_frame(&mut buf).unwrap();
    assert_eq!(info.bit_depth, png::BitDepth::Eight);
    let step = match info.color_type {
        png::ColorType::Rgb => 3,
        png::ColorType::Rgba => 4,
        other => panic!("unexpected screenshot colour type {other:?}"),
    };
    let mut counts = std::collections::HashMap::new();
    for px in buf[..info.buffer_size()].chunks_exact(step) {
        *counts.entry((px[0], px[1], px[2])).or_insert(0usize) += 1;
    }
    let total: usize = counts.values().sum();
    let most = counts.values().copied().max().unwrap_or(0);
    (counts.len(), most as f64 / total as f64)
}

#[test]
fn page_loads_in_chromium_reports_durations_and_switches_versions() {
    let Some(chromium) = find_chromium() else {
        println!("SKIPPED: no chromium");
        return;
    };
    let dir = std::env::temp_dir().join(format!("tonewright-audition-{}", std::process::id()));
    let _ = std::fs::remove_dir_all(&dir);
    std::fs::create_dir_all(&dir).unwrap();
    let site = dir.join("page");
    std::fs::create_dir_all(&site).unwrap();

    let lengths = [("input.wav", 0.5), ("float.wav", 0.75), ("fixed q1.15.wav", 1.0)];
    for (i, (name, seconds)) in lengths.iter().enumerate() {
        write_sine(&site.join(name), *seconds, 440.0 * (i + 1) as f64);
    }
    let figure = FrequencyFigure {
        title: "browser test".into(),
        y_label: "magnitude (dB)".into(),
        curves: vec![Curve {
            label: "float".into(),
            points: (0..50)
                .map(|i| (20.0 * 1000f64.powf(f64::from(i) / 49.0), -f64::from(i)))
                .collect(),
            style: CurveStyle::Float,
        }],
        markers: vec![],
        x_range: (20.0, 20000.0),
        y_range: None,
    };
    write_svg(&site.join("magnitude.svg"), &frequency_svg(&figure).unwrap(), &[]).unwrap();
    let offsets = [0.0, -3.0, -6.0];
    let page = AuditionPage {
        title: "browser test <tone>".into(),
        summary_lines: vec!["three sines of known length".into()],
        metrics: vec![("rate".into(), "48000 Hz".into())],
        figures: vec!["magnitude.svg".into()],
        tracks: lengths
            .iter()
            .zip(offsets)
            .map(|((name, seconds), offset)| Track {
                label: name.trim_end_matches(".wav").into(),
                file_name: name.to_string(),
                level_offset_db: offset,
                duration_s: *seconds,
            })
            .collect(),
    };
    write_page(&site, &page).unwrap();
    let url = format!("file://{}", site.join("index.html").display()).replace(' ', "%20");

    let dom = run_chromium(&chromium, &dir, &["--dump-dom".into()], &format!("{url}#selfcheck"));
    let seen = selfcheck_json(&dom);
    assert_eq!(seen["errors"], serde_json::json!([]), "page errors: {seen}");
    let durations = seen["durations"].as_array().unwrap();
    assert_eq!(durations.len(), lengths.len());
    for (got, (name, want)) in durations.iter().zip(lengths) {
        let got = got.as_f64().unwrap_or(f64::NAN);
        assert!((got - want).abs() <= 1e-3, "{name}: duration {got} s, file holds {want} s");
    }
    assert_eq!(seen["activeBefore"], 0);
    assert_eq!(seen["activeAfter"], 1, "{seen}");
    assert_eq!(seen["dataActive"], "1");
    assert_eq!(
        seen["playing"],
        serde_json::json!([false, true, false]),
        "only the chosen version plays"
    );
    let (before, after) =
        (seen["positionBefore"].as_f64().unwrap(), seen["positionAfter"].as_f64().unwrap());
    assert!((after - before).abs() < 0.05, "position {before} s became {after} s");
    // Volumes at the default −24 dB master, relative to the loudest offset (0 dB).
    let volumes: Vec<f64> =
        seen["volumes"].as_array().unwrap().iter().map(|v| v.as_f64().unwrap()).collect();
    for (got, offset) in volumes.iter().zip(offsets) {
        let want = 10f64.powf((-24.0 + offset) / 20.0);
        assert!((got - want).abs() < 1e-6, "volume {got}, want {want}");
    }

    let shot = dir.join("shot.png");
    run_chromium(
        &chromium,
        &dir,
        &[
            format!("--screenshot={}", shot.display()),
            "--window-size=1280,1600".into(),
            "--hide-scrollbars".into(),
        ],
        &url,
    );
    let (colours, dominant) = colour_variety(&shot);
    assert!(colours >= 32, "screenshot has only {colours} colours");
    assert!(dominant < 0.9, "one colour covers {:.0} % of the screenshot", 100.0 * dominant);
    std::fs::remove_dir_all(&dir).unwrap();
}
