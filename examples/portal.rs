//! Build an invented single-bay portal frame in code, check it under the ASCE/SEI 7-16
//! strength combinations with the AISC 360-16 Appendix 8 method, and print the governing
//! design moment of every member.
//!
//! ```sh
//! cargo run --example portal
//! ```
//!
//! The building is invented and its section values are illustrative.

use plumbline::{ActionCategory, Check, FrameBuilder, LoadLevel, SecondOrderMethod};
use std::process::ExitCode;

fn main() -> ExitCode {
    match run() {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("error: {e}");
            eprintln!("{}", plumbline::CAUTION);
            ExitCode::FAILURE
        }
    }
}

fn run() -> Result<(), plumbline::Error> {
    // SI throughout: m, Pa, m², m⁴, N, N/m.
    let mut frame = FrameBuilder::new("Invented workshop portal, 12 m span, 5 m eaves");
    frame
        .material("steel", 200e9)
        .section("column", 9.5e-3, 2.2e-4)
        .section("rafter", 8.4e-3, 2.9e-4)
        .node("A", 0.0, 0.0)
        .node("B", 0.0, 5.0)
        .node("C", 12.0, 5.0)
        .node("D", 12.0, 0.0)
        .member("C1", "A", "B", "steel", "column")
        .member("R1", "B", "C", "steel", "rafter")
        .member("C2", "D", "C", "steel", "column")
        .fixed("A")
        .fixed("D")
        .case("D", ActionCategory::Dead)
        .line_load("D", "R1", 8.0e3)
        .case("Lr", ActionCategory::RoofLive)
        .line_load("Lr", "R1", 5.0e3)
        .case("S", ActionCategory::Snow)
        .level("S", LoadLevel::Nominal)
        .line_load("S", "R1", 6.0e3)
        .case("W", ActionCategory::Wind)
        .level("W", LoadLevel::Strength)
        .reversible("W")
        .node_load("W", "B", 18.0e3, 0.0);
    let model = frame.build()?;

    let outcome = Check::new(&model)
        .table("asce7-16-strength")
        .method(SecondOrderMethod::AiscB1B2)
        .run()?;

    println!("{}", model.title);
    println!(
        "{} factored cases of {} ({}, edition {})",
        outcome.cases.len(),
        outcome.table.title,
        outcome.table.standard,
        outcome.table.edition
    );
    println!();
    println!(
        "{:<7} {:>12} {:>8} {:>12}  {:<8} case",
        "member", "M (kN·m)", "x (m)", "N (kN)", "part"
    );
    for g in outcome.governing() {
        println!(
            "{:<7} {:>12.1} {:>8.2} {:>12.1}  {:<8} {}",
            g.member,
            g.moment / 1e3,
            g.x,
            g.axial / 1e3,
            g.governs,
            g.case
        );
    }
    println!();
    for (k, verdict) in outcome.story_verdicts().iter().enumerate() {
        println!("story {}: {verdict}", k + 1);
    }
    if !outcome.is_stable() {
        println!("unstable cases: {}", outcome.envelope.unstable.join(", "));
    }
    println!();
    println!("{}", outcome.caution());
    Ok(())
}
