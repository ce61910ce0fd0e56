//! Timing of the whole `check` job on invented regular frames of growing size.
//!
//! Run with `cargo bench --bench check` (or `cargo bench --bench check -- quick` for the
//! smallest frame only). Each frame is generated from a model file written here: `bays` ×
//! `stories`, fixed bases, dead, live and wind (two directions) load cases, the ASCE/SEI 7-16
//! strength table, the AISC Appendix 8 method and notional loads. The program prints the
//! size, the number of factored cases checked and the times of the stages. Timings are
//! printed, never asserted.

use std::time::Instant;

use plumbline::check::check;
use plumbline::combos::{expand, load_table};
use plumbline::input::parse_model;

fn model_text(bays: usize, stories: usize) -> String {
    let list = |n: usize, v: f64| vec![format!("{v}"); n].join(", ");
    format!(
        r#"title = "bench frame {bays} x {stories}"
units = "kN-m"
[[material]]
id = "S"
E = "200 GPa"
unit_weight = "77 kN/m^3"
[[section]]
id = "COL"
A = "20000 mm^2"
I = "4.0e8 mm^4"
role = "column"
[[section]]
id = "BM"
A = "10000 mm^2"
I = "5.0e8 mm^4"
role = "beam"
[frame]
bays = [{}]
stories = [{}]
base = "fixed"
material = "S"
columns = ["COL"]
beams = ["BM"]
[[case]]
id = "D"
category = "dead"
self_weight = true
[[case.member_load]]
members = "B*"
kind = "uniform"
direction = "down"
w = 20
[[case]]
id = "L"
category = "live"
[[case.member_load]]
members = "B*"
kind = "uniform"
direction = "down"
w = 10
[[case]]
id = "WL"
category = "wind"
alternative = "wind"
[[case.node_load]]
nodes = "N1.*"
fx = 10
[[case]]
id = "WR"
category = "wind"
alternative = "wind"
[[case.node_load]]
nodes = "N{}.*"
fx = -10
"#,
        list(bays, 8.0),
        list(stories, 4.0),
        bays + 1
    )
}

fn main() {
    let quick = std::env::args().any(|a| a == "quick");
    let sizes: &[(usize, usize)] = if quick {
        &[(3, 8)]
    } else {
        &[(3, 8), (8, 25), (10, 50), (20, 50)]
    };
    println!("bays x stories   members   cases   parse (ms)   check (ms)   per case (ms)");
    for &(bays, stories) in sizes {
        let text = model_text(bays, stories);
        let t0 = Instant::now();
        let model = parse_model(&text, "bench.toml").expect("bench model parses");
        let t_parse = t0.elapsed();
        let table = load_table("asce7-16-strength", None).expect("shipped table");
        let cases = expand(&table, &model.load_cases, &Default::default())
            .expect("expands")
            .cases;
        let t1 = Instant::now();
        let report = check(&model, &cases).expect("bench frame checks");
        let t_check = t1.elapsed();
        let n = report.cases.len();
        println!(
            "{:>4} x {:<9} {:>9} {:>7} {:>12.1} {:>12.1} {:>15.1}",
            bays,
            stories,
            model.members.len(),
            n,
            t_parse.as_secs_f64() * 1e3,
            t_check.as_secs_f64() * 1e3,
            t_check.as_secs_f64() * 1e3 / n as f64
        );
    }
}
