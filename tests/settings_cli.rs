//! Settings that follow the method (issue 7 item 8, issue 8 "Also") and the exit status
//! (issue 7 item 11), as a user runs the program.
//!
//! Sources: AISC 360-16 §C2.3 direct-analysis stiffness 0.8·τb·EI and 0.8·EA, §C2.2b
//! notional load 0.002·Yi, §C2.3(c) additional 0.001·Yi with τb = 1.0 (from memory; the
//! reference notes §9 carry them). EN 1993-1-1:2005 §5.2 makes no stiffness reduction and
//! §5.3.2 gives the sway imperfection (from memory). Exit codes are the project's contract
//! (docs/commands.md "Exit status", no external source).

mod common;

use common::verify;
use std::path::{Path, PathBuf};
use std::process::{Command, Output};

const BIN: &str = env!("CARGO_BIN_EXE_plumbline");
const ROOT: &str = env!("CARGO_MANIFEST_DIR");
const PORTAL: &str = "examples/workshop-portal.toml";

/// Run the program, wide enough that no table row wraps (the assertions read whole rows).
fn run(args: &[&str]) -> Output {
    Command::new(BIN)
        .args(args)
        .env("COLUMNS", "1000")
        .current_dir(ROOT)
        .output()
        .expect("the plumbline binary runs")
}

fn json(args: &[&str]) -> serde_json::Value {
    let mut all = args.to_vec();
    all.extend(["--format", "json"]);
    let o = run(&all);
    assert!(
        matches!(o.status.code(), Some(0 | 3)),
        "{args:?}: {}",
        String::from_utf8_lossy(&o.stderr)
    );
    serde_json::from_slice(&o.stdout).unwrap()
}

fn scratch(name: &str, text: &str) -> PathBuf {
    let d = std::env::temp_dir().join(format!("plumbline-settings-{}", std::process::id()));
    std::fs::create_dir_all(&d).unwrap();
    let p = d.join(name);
    std::fs::write(&p, text).unwrap();
    p
}

#[test]
fn direct_method_defaults_to_the_chapter_c_rules() {
    // Issue 8 "Also": `--second-order direct` with no stiffness or notional setting in the
    // model uses AISC 360-16 §C2.3 (0.8·τb·EI, 0.8·EA) and §C2.2b notional loads, and the
    // heading says so.
    let v = json(&["check", PORTAL, "--second-order", "direct"]);
    let r = &v["report"];
    assert_eq!(r["stiffness"], "aisc-direct");
    assert_eq!(r["origin"]["stiffness"], "method-default");
    assert_eq!(r["origin"]["notional"], "method-default");
    let o = run(&["check", PORTAL, "--second-order", "direct", "--detail"]);
    let text = String::from_utf8_lossy(&o.stdout);
    // The settings table of the summary: the setting name, then a wide gap.
    let line = |key: &str| -> String {
        text.lines()
            .find(|l| l.trim_start().starts_with(&format!("{key}   ")))
            .unwrap_or_else(|| panic!("no {key} line in\n{text}"))
            .to_string()
    };
    let stiffness = line("analysis stiffness");
    assert!(
        stiffness.contains("aisc-direct: AISC 360-16 §C2.3")
            && stiffness.contains("method default (direct)"),
        "{stiffness}"
    );
    let notional = line("notional loads");
    assert!(
        notional.contains("0.0020·α·Yi (AISC 360-16 §C2.2b)")
            && notional.contains("0.001·α·Yi of §C2.3(c)")
            && notional.contains("method default (direct)"),
        "{notional}"
    );
    // The gravity-only cases carry notional loads as two terms: 0.002·Yi (§C2.2b) and the
    // 0.001·Yi of §C2.3(c), in the ratio 2 : 1 at every level (closed form: both are
    // coefficients on the same Yi).
    let case = r["cases"]
        .as_array()
        .unwrap()
        .iter()
        .find(|c| c["notional_terms"].as_array().is_some_and(|t| t.len() == 2))
        .expect("a case with notional loads");
    let t = case["notional_terms"].as_array().unwrap();
    let coefficient = |k: usize| t[k]["coefficient"].as_f64().unwrap();
    verify::source("AISC 360-16 §C2.2b (from memory; reference notes §9)");
    verify::close("notional coefficient", "-", coefficient(0), 0.002, 0.0);
    verify::source("AISC 360-16 §C2.3(c), τb = 1.0 (from memory; reference notes §9)");
    verify::close(
        "additional notional coefficient",
        "-",
        coefficient(1),
        0.001,
        0.0,
    );
    let (a, b) = (
        t[0]["forces"][0].as_f64().unwrap(),
        t[1]["forces"][0].as_f64().unwrap(),
    );
    verify::source("closed form: 0.002·Yi and 0.001·Yi are coefficients on the same Yi");
    verify::close(
        "level 1: 0.002·Yi term = 2 × the 0.001·Yi term",
        "N",
        a,
        2.0 * b,
        1e-12,
    );
    let total = case["notional"][0].as_f64().unwrap();
    verify::close(
        "level 1: notional load = sum of its terms",
        "N",
        total,
        a + b,
        1e-12,
    );
    assert!(
        text.contains("of which 0.001·Yi, AISC 360-16 §C2.3(c)"),
        "{text}"
    );
}

#[test]
fn each_method_brings_its_own_defaults_and_the_command_line_overrides_them() {
    // EN 1993-1-1 route: gross stiffness, EC3 sway imperfection (no 0.8 EI).
    let v = json(&["check", PORTAL, "--second-order", "ec3-alpha-cr"]);
    assert_eq!(v["report"]["stiffness"], "gross");
    // ACI 318-19 route: Table 6.6.3.1.1(a) cracked sections, no notional loads.
    let v = json(&["check", PORTAL, "--second-order", "aci-magnifier"]);
    assert_eq!(v["report"]["stiffness"], "aci-cracked");
    // Command line wins, and says so.
    let v = json(&[
        "check",
        PORTAL,
        "--second-order",
        "direct",
        "--stiffness",
        "gross",
        "--notional",
        "0.003",
    ]);
    let r = &v["report"];
    assert_eq!(r["stiffness"], "gross");
    assert_eq!(r["origin"]["stiffness"], "command-line");
    assert_eq!(r["origin"]["notional"], "command-line");
    // A user coefficient is used as given: with gross stiffness there is no §C2.3(c) term.
    for c in r["cases"].as_array().unwrap() {
        for t in c["notional_terms"].as_array().unwrap() {
            assert_eq!(t["coefficient"], 0.003);
        }
    }
    // With the reduced stiffness the 0.001·Yi is its own term; 0.003 is never raised.
    let v = json(&["check", PORTAL, "--notional", "0.003"]);
    for c in v["report"]["cases"].as_array().unwrap() {
        let t = c["notional_terms"].as_array().unwrap();
        if !t.is_empty() {
            assert_eq!(t[0]["coefficient"], 0.003);
            assert_eq!(t[1]["coefficient"], 0.001);
        }
    }
}

#[test]
fn exit_status_tells_success_failure_usage_and_unstable() {
    // 0: ran, every case stable.
    assert_eq!(run(&["check", PORTAL]).status.code(), Some(0));
    // 2: the command line is wrong (unknown option; a bad --notional value).
    assert_eq!(
        run(&["check", PORTAL, "--no-such-option"]).status.code(),
        Some(2)
    );
    assert_eq!(
        run(&["check", PORTAL, "--notional", "lots"]).status.code(),
        Some(2)
    );
    // 1: bad input (a missing file).
    assert_eq!(run(&["check", "no/such/model.toml"]).status.code(), Some(1));
    // 3: ran and reported, but some case is unstable: the roof load raised a thousandfold
    // (3 000 kN/m on a 12 m HE300A portal, far above any sway buckling load).
    let text = std::fs::read_to_string(Path::new(ROOT).join(PORTAL)).unwrap();
    let heavy = text.replace(
        "w = 3.0                   # kN/m: 0.5 kN/m2 x 6 m",
        "w = 3000.0",
    );
    assert_ne!(heavy, text);
    let p = scratch("heavy.toml", &heavy);
    let o = run(&["check", p.to_str().unwrap()]);
    assert_eq!(
        o.status.code(),
        Some(3),
        "{}",
        String::from_utf8_lossy(&o.stderr)
    );
    assert!(String::from_utf8_lossy(&o.stdout).contains("UNSTABLE"));
}
