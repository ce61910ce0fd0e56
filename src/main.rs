//! plumbline command line: argument parsing only; the work is done by `plumbline::app`.

use std::io::Write;
use std::path::{Path, PathBuf};
use std::process::ExitCode;

use clap::{Args, CommandFactory, Parser, Subcommand};
use plumbline::app::{self, AppError, CheckArgs, NewArgs, Rendered};
use plumbline::model::SecondOrderMethod;
use plumbline::report::compare::CompareFormat;
use plumbline::report::{CheckFormat, OutputFormat};

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
    /// Write the check as one self-contained HTML file with drawings of the frame, its
    /// loads and its moment envelope, for reading or printing to PDF.
    Report(ReportCli),
    /// Check the model under several variants (combination tables, second-order methods,
    /// stiffness or notional settings, table parameters) and set the governing values side
    /// by side, with their ratios to the reference.
    Compare(CompareCli),
    /// Write a commented starter model of a regular frame from its bay widths and story
    /// heights.
    New(NewCli),
    /// Print a shell completion script (bash, zsh, fish, elvish or powershell).
    Completions(CompletionsCli),
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
    /// Member stiffness: gross (the default: a service load case), aci-cracked,
    /// aisc-direct or aci-service.
    #[arg(long, value_name = "PRESET", default_value = "gross",
          value_parser = ["gross", "aci-cracked", "aisc-direct", "aci-service"])]
    stiffness: String,
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
    #[arg(long, value_parser = TableName, hide_possible_values = true)]
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
    #[arg(value_parser = TableName, hide_possible_values = true)]
    table: Option<String>,
}

/// A combination table named on the command line: any text is accepted (a shipped name or
/// a path, read later by `app`), and the shipped names are offered as possible values so
/// that the shell completions list them.
#[derive(Debug, Clone, Copy)]
struct TableName;

impl clap::builder::TypedValueParser for TableName {
    type Value = String;

    fn parse_ref(
        &self,
        cmd: &clap::Command,
        arg: Option<&clap::Arg>,
        value: &std::ffi::OsStr,
    ) -> Result<String, clap::Error> {
        clap::builder::StringValueParser::new().parse_ref(cmd, arg, value)
    }

    fn possible_values(
        &self,
    ) -> Option<Box<dyn Iterator<Item = clap::builder::PossibleValue> + '_>> {
        Some(Box::new(
            plumbline::combos::shipped_tables()
                .iter()
                .map(|t| clap::builder::PossibleValue::new(t.name)),
        ))
    }
}

/// The model and analysis options shared by `check` and `report`.
#[derive(Debug, Args)]
struct RunCli {
    /// The model file (TOML).
    model: PathBuf,
    /// Combination table: a shipped name (see `plumbline combos`) or a path; overrides the
    /// model's own choice.
    #[arg(long, value_parser = TableName, hide_possible_values = true)]
    combos: Option<String>,
    /// Override a table parameter, e.g. --set l_companion=0.5 (repeatable).
    #[arg(long = "set", value_name = "PARAM=VALUE")]
    sets: Vec<String>,
    /// Second-order method: aisc-b1b2 (AISC 360-16 App. 8), aci-magnifier (ACI 318-19
    /// §6.6.4), ec3-alpha-cr (EN 1993-1-1 §5.2) or direct (P-Δ/P-δ analysis); overrides the
    /// model's [analysis] method.
    #[arg(long = "second-order", value_name = "METHOD", value_parser = method_parser())]
    method: Option<SecondOrderMethod>,
    /// Analysis stiffness: gross, aci-cracked, aisc-direct, or auto (what the method calls
    /// for: AISC 360-16 §C2.3 for aisc-b1b2 and direct, ACI 318-19 Table 6.6.3.1.1(a) for
    /// aci-magnifier, gross for ec3-alpha-cr); overrides the model.
    #[arg(long, value_name = "PRESET")]
    stiffness: Option<String>,
    /// Notional loads: auto (what the method calls for), none, aisc, ec3-imperfection, or an
    /// AISC coefficient such as 0.003; overrides the model.
    #[arg(long, value_name = "KIND")]
    notional: Option<String>,
    /// Only the factored cases whose id starts with this (implies --detail).
    #[arg(long)]
    case: Option<String>,
    /// Serviceability table (a shipped name or a path, basis serviceability): adds the
    /// serviceability half (story drift, beam deflection, limits and verdicts); overrides the
    /// model's [combinations] service.
    #[arg(long, value_name = "NAME|PATH")]
    service: Option<String>,
    /// Stiffness of the serviceability analysis: gross, or aci-service (ACI 318-19
    /// §6.6.3.2.2, 1.4 × the cracked values, at most Ig); default gross (aci-service under
    /// aci-magnifier); overrides the model's [analysis] service_stiffness.
    #[arg(long, value_name = "PRESET", value_parser = ["gross", "aci-service"])]
    service_stiffness: Option<String>,
}

impl RunCli {
    /// The library's options, with `format` and `detail`.
    fn args(self, format: CheckFormat, detail: bool) -> (PathBuf, CheckArgs) {
        let args = CheckArgs {
            combos: self.combos,
            sets: self.sets,
            method: self.method,
            stiffness: self.stiffness,
            notional: self.notional,
            case: self.case,
            service: self.service,
            service_stiffness: self.service_stiffness,
            format,
            detail,
            ..Default::default()
        };
        (self.model, args)
    }
}

#[derive(Debug, Args)]
struct CheckCli {
    #[command(flatten)]
    run: RunCli,
    /// Add the per-case story and member tables to the summary.
    #[arg(long)]
    detail: bool,
    /// table: the one-page summary in the model's units; json: everything, SI base units;
    /// csv: one file per table (-o DIR writes them into DIR); md: a calculation-package page.
    #[arg(long, value_enum, default_value_t)]
    format: CheckFormat,
    /// Also estimate every member's first-order moments by the hand methods (beams with
    /// inflection points at 0.1 L, columns by joint unbalance, portal method for lateral
    /// load) beside the computed ones, and flag members far off.
    #[arg(long)]
    approximate: bool,
    /// JSON and CSV without each case's member results: the JSON's report.cases[].members
    /// and buckled_shape are left empty (case_detail: false), the CSV files case-members and
    /// case-end-actions are not written. The envelopes, governing moments, story figures and
    /// reactions of every case stay. For large frames: a far smaller file, and the run keeps
    /// no case's members. The one-page summary is lean already.
    #[arg(long, conflicts_with_all = ["detail", "case"])]
    lean: bool,
    #[command(flatten)]
    out: Output,
}

#[derive(Debug, Args)]
struct ReportCli {
    #[command(flatten)]
    run: RunCli,
    /// The HTML file to write (default: the model file's name with .html, beside it).
    #[arg(long, short)]
    output: Option<PathBuf>,
}

#[derive(Debug, Args)]
struct CompareCli {
    /// The model file (TOML).
    model: PathBuf,
    /// A variant, `[LABEL:] key=value …` (repeatable): keys combos, second-order, stiffness
    /// and notional take the values of the check options of those names; any other key is a
    /// table parameter, e.g. `eu: combos=en1990-6.10 second-order=ec3-alpha-cr` or
    /// `half-L: l_companion=0.5`. With one variant the model as written is the reference;
    /// with two or more the first given is.
    #[arg(long = "variant", value_name = "SPEC", required = true)]
    variants: Vec<String>,
    /// table: aligned tables in the model's units; json: SI base units; csv: one file per
    /// table (-o DIR); md: a Markdown page; html: a page with the ratio chart.
    #[arg(long, value_enum, default_value_t)]
    format: CompareFormat,
    #[command(flatten)]
    out: Output,
}

#[derive(Debug, Args)]
struct NewCli {
    /// The model file to create (refused if it exists).
    file: PathBuf,
    /// Bay widths, left to right, comma-separated (e.g. 7.5,6,7.5).
    #[arg(long, value_delimiter = ',', required = true, num_args = 1..)]
    bays: Vec<f64>,
    /// Story heights, bottom up, comma-separated (e.g. 4.5,3.6,3.6).
    #[arg(long, value_delimiter = ',', required = true, num_args = 1..)]
    stories: Vec<f64>,
    /// Unit preset of the bare numbers.
    #[arg(long, default_value = "kN-m", value_parser = ["kN-m", "kip-ft", "kip-in", "N-mm"])]
    units: String,
    /// Base of the columns.
    #[arg(long, default_value = "fixed", value_parser = ["fixed", "pinned"])]
    base: String,
}

#[derive(Debug, Args)]
struct CompletionsCli {
    /// The shell.
    shell: clap_complete::Shell,
}

/// What a command produced: its output and where it goes.
struct Done {
    /// What to write; `None` when the command wrote its output itself (`written`).
    rendered: Option<Rendered>,
    output: Option<PathBuf>,
    /// Paths already written (`check`, which streams its report).
    written: Vec<PathBuf>,
    /// `check` found an unstable case (exit status 3).
    unstable: bool,
}

/// A progress bar on standard error for runs longer than about a second; indicatif draws
/// nothing when standard error is not a terminal.
fn progress_bar() -> impl FnMut(usize, usize) {
    let started = std::time::Instant::now();
    let mut bar: Option<indicatif::ProgressBar> = None;
    move |done, total| {
        if bar.is_none() && started.elapsed() > std::time::Duration::from_secs(1) && done < total {
            let b = indicatif::ProgressBar::with_draw_target(
                Some(total as u64),
                indicatif::ProgressDrawTarget::stderr(),
            );
            b.set_message("factored cases");
            bar = Some(b);
        }
        if let Some(b) = &bar {
            b.set_position(done as u64);
            if done == total {
                b.finish_and_clear();
            }
        }
    }
}

/// `--second-order` values: clap lists them when one is wrong.
fn method_parser() -> impl clap::builder::TypedValueParser<Value = SecondOrderMethod> {
    use clap::builder::TypedValueParser;
    clap::builder::PossibleValuesParser::new(plumbline::input::validate::METHOD_NAMES)
        .map(|s| s.parse::<SecondOrderMethod>().unwrap_or_default())
}

impl Command {
    /// The model file the command reads, if any.
    fn model(&self) -> Option<&Path> {
        match self {
            Command::Solve(a) => Some(&a.model),
            Command::Cases(a) => Some(&a.model),
            Command::Check(a) => Some(&a.run.model),
            Command::Report(a) => Some(&a.run.model),
            Command::Compare(a) => Some(&a.model),
            Command::Combos(_) | Command::New(_) | Command::Completions(_) => None,
        }
    }

    /// The output file and the input files it must not be, for commands that write one.
    fn output_and_inputs(&self) -> Option<(&Path, Vec<&Path>)> {
        let (output, model, combos) = match self {
            Command::Solve(a) => (&a.out.output, &a.model, None),
            Command::Cases(a) => (&a.out.output, &a.model, a.combos.as_deref()),
            Command::Check(a) => (&a.out.output, &a.run.model, a.run.combos.as_deref()),
            Command::Report(a) => (&a.output, &a.run.model, a.run.combos.as_deref()),
            Command::Compare(a) => (&a.out.output, &a.model, None),
            Command::Combos(_) | Command::New(_) | Command::Completions(_) => return None,
        };
        let inputs = std::iter::once(model.as_path())
            .chain(combos.map(Path::new))
            .collect();
        Some((output.as_deref()?, inputs))
    }
}

fn run(cli: Cli) -> Result<Done, AppError> {
    // Implausible member properties are said first, before any result or error.
    for w in cli
        .command
        .model()
        .map(app::model_warnings)
        .unwrap_or_default()
    {
        let _ = writeln!(std::io::stderr(), "plumbline: warning: {w}");
    }
    if let Some((output, inputs)) = cli.command.output_and_inputs() {
        app::check_output_path(output, &inputs)?;
    }
    let text = |t: String, output| Done {
        rendered: Some(Rendered::text(t)),
        output,
        written: Vec::new(),
        unstable: false,
    };
    Ok(match cli.command {
        Command::Solve(a) => Done {
            rendered: Some(app::solve_with(&a.model, &a.case, &a.stiffness, a.format)?),
            output: a.out.output,
            written: Vec::new(),
            unstable: false,
        },
        Command::Cases(a) => text(
            app::cases(&a.model, a.combos.as_deref(), &a.sets, a.format)?,
            a.out.output,
        ),
        Command::Combos(a) => text(app::combos(a.table.as_deref())?, None),
        Command::Check(a) => {
            let (model, mut args) = a.run.args(a.format, a.detail);
            args.approximate = a.approximate;
            args.lean = a.lean;
            let output = a.out.output;
            let (written, unstable) =
                app::check_and_emit(&model, &args, output.as_deref(), &mut progress_bar())?;
            Done {
                rendered: None,
                output,
                written,
                unstable,
            }
        }
        Command::Report(a) => {
            let (model, args) = a.run.args(CheckFormat::Table, false);
            let output = a.output.unwrap_or_else(|| model.with_extension("html"));
            // The default name is derived from the model's: never let it be an input.
            let inputs: Vec<&Path> = std::iter::once(model.as_path())
                .chain(args.combos.as_deref().map(Path::new))
                .collect();
            app::check_output_path(&output, &inputs)?;
            text(
                app::report(&model, &args, &mut progress_bar())?,
                Some(output),
            )
        }
        Command::Compare(a) => {
            let specs = a
                .variants
                .iter()
                .enumerate()
                .map(|(k, v)| app::parse_variant(v, k + 1))
                .collect::<Result<Vec<_>, _>>()?;
            let run = app::run_compare(&a.model, &specs, &mut progress_bar())?;
            Done {
                rendered: Some(Rendered {
                    files: plumbline::report::export::render_compare(&run.view(), a.format),
                }),
                output: a.out.output,
                written: Vec::new(),
                unstable: false,
            }
        }
        Command::New(a) => {
            let args = NewArgs {
                bays: a.bays,
                stories: a.stories,
                units: a.units,
                base: a.base,
            };
            text(app::new_model(&a.file, &args)?, Some(a.file))
        }
        Command::Completions(a) => {
            let mut out = Vec::new();
            clap_complete::generate(a.shell, &mut Cli::command(), "plumbline", &mut out);
            text(String::from_utf8_lossy(&out).into_owned(), None)
        }
    })
}

/// The width text output is fitted to: the `COLUMNS` variable, else the terminal's width,
/// else [`plumbline::report::DEFAULT_TEXT_WIDTH`] (output that is not a terminal).
fn output_width() -> usize {
    std::env::var("COLUMNS")
        .ok()
        .and_then(|v| v.trim().parse::<usize>().ok())
        .filter(|&w| w > 0)
        .or_else(|| terminal_size::terminal_size().map(|(w, _)| usize::from(w.0)))
        .unwrap_or(plumbline::report::DEFAULT_TEXT_WIDTH)
}

fn main() -> ExitCode {
    // Wrap error messages at spaces only, so that an id such as `2.3.1-2a` is never split.
    let _ = miette::set_hook(Box::new(|_| {
        Box::new(
            miette::MietteHandlerOpts::new()
                .word_splitter(textwrap::WordSplitter::NoHyphenation)
                .break_words(false)
                .build(),
        )
    }));
    let cli = Cli::parse();
    plumbline::report::set_text_width(output_width());
    let result = run(cli).and_then(|done| match &done.rendered {
        Some(r) => app::emit(r, done.output.as_deref()).map(|w| (w, done.unstable)),
        None => Ok((done.written, done.unstable)),
    });
    ExitCode::from(match result {
        Ok((written, unstable)) => {
            for p in written {
                let _ = writeln!(std::io::stderr(), "plumbline: wrote {}", p.display());
            }
            if unstable {
                app::exit::UNSTABLE
            } else {
                app::exit::OK
            }
        }
        Err(e) => {
            let code = match e {
                AppError::Usage(_) => app::exit::USAGE,
                _ => app::exit::FAILED,
            };
            // A closed stderr (`plumbline … 2>&1 | head`) must not turn into a panic.
            let _ = writeln!(std::io::stderr(), "{:?}", miette::Report::new(e));
            code
        }
    })
}
