//! Time of `inspect` on a 40-part circuit: load, nodal analysis, bilinear transform,
//! sections, quantization analysis and the report, as the verb does them (the issue's
//! target: under 50 ms). Ids are `inspect/inspect_40_part_circuit/<number format>`.
//! Run: `cargo bench --bench inspect`, then `python3 benches/medians.py inspect`.

use criterion::{criterion_group, criterion_main, BenchmarkId, Criterion, SamplingMode};
use std::time::Duration;
use tonewright::design;
use tonewright::pipeline::port;
use tonewright::report::inspect;

criterion_group!(benches, inspect_40_part_circuit);
criterion_main!(benches);

/// An invented 40-part RC ladder (20 sections of varied values) with a target number
/// format.
fn ladder_design(number: &str) -> String {
    let mut parts = String::new();
    for k in 0..20 {
        let (from, to) = (
            if k == 0 { "in".to_string() } else { format!("n{k}") },
            if k == 19 { "out".to_string() } else { format!("n{}", k + 1) },
        );
        let r = 1.0 + 0.37 * k as f64;
        let c = 10.0 + 3.1 * k as f64;
        parts.push_str(&format!("  {{ r = \"{r:.2}k\", nodes = [\"{from}\", \"{to}\"] }},\n"));
        parts.push_str(&format!("  {{ c = \"{c:.1}n\", nodes = [\"{to}\", \"gnd\"] }},\n"));
    }
    format!("[target]\nrate = 48000\nnumber = \"{number}\"\n\n[[stage]]\nkind = \"circuit\"\nparts = [\n{parts}]\n")
}

/// The float report alone (f64 target) and with the quantization analysis (q31), 20
/// samples each. An iteration takes 10 to 50 ms, so a sample averages a few iterations.
fn inspect_40_part_circuit(c: &mut Criterion) {
    let mut g = c.benchmark_group("inspect");
    g.sampling_mode(SamplingMode::Flat)
        .sample_size(20)
        .warm_up_time(Duration::from_secs(1))
        .measurement_time(Duration::from_secs(2));
    for number in ["f64", "q31"] {
        let text = ladder_design(number);
        g.bench_function(BenchmarkId::new("inspect_40_part_circuit", number), |b| {
            b.iter(|| {
                let d = design::parse("ladder.toml", &text, text.as_bytes()).unwrap();
                let number = d.target.number;
                let p = port(d, &[], 48000.0).unwrap();
                inspect::build(&p, number, None).unwrap().to_text()
            })
        });
    }
    g.finish();
}
