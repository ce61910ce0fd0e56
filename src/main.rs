//! plumbline command line: argument parsing and calls into the library.

use std::process::ExitCode;

use clap::{Args, Parser, Subcommand};
use plumbline::combos::{load_table, render_table, render_table_list};
use plumbline::diag::FileError;

/// Planar frame analysis with factored load combinations from data tables.
/// Results assist a licensed engineer; local codes and the adopted edition of each standard govern.
#[derive(Debug, Parser)]
#[command(name = "plumbline", version)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Debug, Subcommand)]
enum Command {
    /// List the shipped combination tables, or print one table's combinations.
    Combos(CombosArgs),
}

/// `plumbline combos [NAME|PATH]`.
#[derive(Debug, Args)]
struct CombosArgs {
    /// A shipped table name (e.g. asce7-16-strength) or the path of a table file.
    table: Option<String>,
}

/// Run `plumbline combos`.
#[allow(clippy::result_large_err)]
fn run_combos(args: &CombosArgs) -> Result<String, FileError> {
    match &args.table {
        None => render_table_list(),
        Some(name) => load_table(name, None).map(|t| render_table(&t)),
    }
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    let result = match &cli.command {
        Command::Combos(a) => run_combos(a),
    };
    match result {
        Ok(text) => {
            print!("{text}");
            ExitCode::SUCCESS
        }
        Err(e) => {
            eprintln!("{:?}", miette::Report::new(e));
            ExitCode::FAILURE
        }
    }
}
