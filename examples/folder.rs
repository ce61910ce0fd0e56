//! Check every model file (`*.toml`) in a folder with its own combination table and method,
//! and write one CSV row per member to standard output: the governing design moment with
//! its case and the concurrent axial force. Files that cannot be read or checked are
//! skipped and reported on standard error; the exit status is then 1.
//!
//! ```sh
//! cargo run --example folder -- examples > members.csv
//! ```
//!
//! Values are SI (N·m, N, m). The caution closes the CSV as a `#` line.

use std::path::{Path, PathBuf};
use std::process::ExitCode;

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let [dir] = args.as_slice() else {
        eprintln!("usage: folder DIR   (checks every .toml model in DIR, CSV on stdout)");
        return ExitCode::from(2);
    };
    let files = match models_in(Path::new(dir)) {
        Ok(f) => f,
        Err(e) => {
            eprintln!("error: cannot list {dir}: {e}");
            return ExitCode::FAILURE;
        }
    };
    println!("model,member,moment_N_m,location,x_m,case,governs,axial_N,stable_run");
    let mut skipped = 0;
    for file in &files {
        match plumbline::check_file(file) {
            Ok(outcome) => {
                let name = file.display().to_string();
                for g in outcome.governing() {
                    let row = [
                        name.clone(),
                        g.member.clone(),
                        format!("{:.6e}", g.moment),
                        g.location.to_string(),
                        format!("{:.4}", g.x),
                        g.case.clone(),
                        g.governs.clone(),
                        format!("{:.6e}", g.axial),
                        outcome.is_stable().to_string(),
                    ];
                    let cells: Vec<String> = row.iter().map(|c| csv_cell(c)).collect();
                    println!("{}", cells.join(","));
                }
            }
            Err(e) => {
                skipped += 1;
                eprintln!("skipped {}: {e}", file.display());
            }
        }
    }
    println!("# {}", plumbline::CAUTION);
    eprintln!(
        "{} of {} model files checked; {skipped} skipped",
        files.len() - skipped,
        files.len()
    );
    eprintln!("{}", plumbline::CAUTION);
    if skipped == 0 {
        ExitCode::SUCCESS
    } else {
        ExitCode::FAILURE
    }
}

/// The `.toml` files of `dir`, sorted by name.
fn models_in(dir: &Path) -> std::io::Result<Vec<PathBuf>> {
    let mut files: Vec<PathBuf> = std::fs::read_dir(dir)?
        .filter_map(|e| e.ok().map(|e| e.path()))
        .filter(|p| p.is_file() && p.extension().is_some_and(|x| x == "toml"))
        .collect();
    files.sort();
    Ok(files)
}

/// A CSV cell, quoted when it holds a comma, a quote or a line break (RFC 4180).
fn csv_cell(s: &str) -> String {
    if s.contains([',', '"', '\n', '\r']) {
        format!("\"{}\"", s.replace('"', "\"\""))
    } else {
        s.to_string()
    }
}
