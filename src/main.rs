//! plumbline command line: argument parsing only; the work is done by `plumbline::app`.

use std::path::PathBuf;
use std::process::ExitCode;

use clap::{Args, Parser, Subcommand};
use plumbline::app::{self, AppError, CheckArgs};
use plumbline::model::SecondOrderMethod;
use plumbline::report::OutputFormat;

/// Factored load combinations, no-sway and sway analysis, and second-order amplification
/// for planar building frames.
///
/// Results assist a licensed engineer; local codes and the adopted edition of each standard
/// govern.
#[derive(Debug, Parser)]
#[command(name = "plumbline", version)]
struct Cli {
    #[command(subcommand)]
    command: Command,
}

#[derive(Debug, Subcommand)]
enum Command {
    /// Solve one service load case, first order: displacements, reactions and member end
    /// forces in the model's units.
    Solve(SolveArgs),
    /// List the factored cases a combination table makes of the model's load cases.
    Cases(CasesArgs),
    /// List the shipped combination tables, or print one table's combinations as the
    /// standard writes them.
    Combos(CombosArgs),
    /// The main job: solve every factored case held against sway and free to sway, amplify
    /// for second-order effects, classify each story as sway or non-sway, and report the
    /// moments of every member.
    Check(CheckCli),
}

#[derive(Debug, Args)]
struct Output {
    /// Write the report to this file (whole or not at all) instead of the terminal.
    #[arg(long, short)]
    output: Option<PathBuf>,
}

#[derive(Debug, Args)]
struct SolveArgs {
    /// The model file (TOML).
    model: PathBuf,
    /// Id of the load case to solve.
    #[arg(long)]
    case: String,
    /// table: aligned tables in the model's units; json: SI base units; csv: member ends.
    #[arg(long, value_enum, default_value_t)]
    format: OutputFormat,
    #[command(flatten)]
    out: Output,
}

#[derive(Debug, Args)]
struct CasesArgs {
    /// The model file (TOML).
    model: PathBuf,
    /// Combination table: a shipped name (see `plumbline combos`) or a path; overrides the
    /// model's own choice.
    #[arg(long)]
    combos: Option<String>,
    /// Override a table parameter, e.g. --set l_companion=0.5 (repeatable).
    #[arg(long = "set", value_name = "PARAM=VALUE")]
    sets: Vec<String>,
    #[arg(long, value_enum, default_value_t)]
    format: OutputFormat,
    #[command(flatten)]
    out: Output,
}

#[derive(Debug, Args)]
struct CombosArgs {
    /// A shipped table name (e.g. asce7-16-strength) or the path of a table file.
    table: Option<String>,
}

#[derive(Debug, Args)]
struct CheckCli {
    /// The model file (TOML).
    model: PathBuf,
    /// Combination table: a shipped name (see `plumbline combos`) or a path; overrides the
    /// model's own choice.
    #[arg(long)]
    combos: Option<String>,
    /// Override a table parameter, e.g. --set l_companion=0.5 (repeatable).
    #[arg(long = "set", value_name = "PARAM=VALUE")]
    sets: Vec<String>,
    /// Second-order method: aisc-b1b2 (AISC 360-16 App. 8), aci-magnifier (ACI 318-19
    /// §6.6.4), ec3-alpha-cr (EN 1993-1-1 §5.2) or direct (P-Δ/P-δ analysis); overrides the
    /// model's [analysis] method.
    #[arg(long = "second-order", value_name = "METHOD")]
    method: Option<SecondOrderMethod>,
    /// Only the factored cases whose id starts with this.
    #[arg(long)]
    case: Option<String>,
    /// table: aligned tables in the model's units; json: everything, SI base units;
    /// csv: one row per case and member.
    #[arg(long, value_enum, default_value_t)]
    format: OutputFormat,
    /// Also estimate every member's first-order moments by the hand methods (beams with
    /// inflection points at 0.1 L, columns by joint unbalance, portal method for lateral
    /// load) beside the computed ones, and flag members far off (table or json).
    #[arg(long)]
    approximate: bool,
    #[command(flatten)]
    out: Output,
}

fn run(cli: Cli) -> Result<(String, Option<PathBuf>), AppError> {
    Ok(match cli.command {
        Command::Solve(a) => (app::solve(&a.model, &a.case, a.format)?, a.out.output),
        Command::Cases(a) => (
            app::cases(&a.model, a.combos.as_deref(), &a.sets, a.format)?,
            a.out.output,
        ),
        Command::Combos(a) => (app::combos(a.table.as_deref())?, None),
        Command::Check(a) => {
            let args = CheckArgs {
                combos: a.combos,
                sets: a.sets,
                method: a.method,
                case: a.case,
                format: a.format,
                approximate: a.approximate,
            };
            (app::check(&a.model, &args)?, a.out.output)
        }
    })
}

fn main() -> ExitCode {
    let cli = Cli::parse();
    let result = run(cli).and_then(|(text, path)| match path {
        Some(p) => app::write_output(&p, &text),
        None => app::write_stdout(&text),
    });
    match result {
        Ok(()) => ExitCode::SUCCESS,
        Err(e) => {
            eprintln!("{:?}", miette::Report::new(e));
            ExitCode::FAILURE
        }
    }
}
