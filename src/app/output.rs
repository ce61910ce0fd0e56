//! Writing what a command rendered: a file written atomically, a directory of CSV files or
//! standard output; [`Destination`] is the same as an export sink, for documents written
//! part by part as they are produced.

use std::io;
use std::path::{Path, PathBuf};

use super::error::AppError;
use crate::report::export::{ExportError, Memory, Sink};

/// Refuse an output file that is one of the input files (the model or a table file named
/// by path), so that `-o` can never overwrite what was read. Paths are compared after
/// resolving links, and on Unix also by device and inode (hard links).
pub fn check_output_path(output: &Path, inputs: &[&Path]) -> Result<(), AppError> {
    for input in inputs {
        if same_file(output, input) {
            return Err(AppError::Usage(format!(
                "the output file {} is the input file {}: refusing to overwrite an input",
                output.display(),
                input.display()
            )));
        }
    }
    Ok(())
}

/// Whether two paths name the same existing file.
fn same_file(a: &Path, b: &Path) -> bool {
    match (std::fs::canonicalize(a), std::fs::canonicalize(b)) {
        (Ok(x), Ok(y)) if x == y => return true,
        (Ok(_), Ok(_)) => {}
        _ => return false,
    }
    #[cfg(unix)]
    {
        use std::os::unix::fs::MetadataExt;
        if let (Ok(x), Ok(y)) = (std::fs::metadata(a), std::fs::metadata(b)) {
            return x.dev() == y.dev() && x.ino() == y.ino();
        }
    }
    false
}

/// The rendered output of a command: one text, or several named files (CSV tables).
#[derive(Debug, Clone, PartialEq)]
pub struct Rendered {
    /// `(file name, text)`; a single text has an empty name.
    pub files: Vec<(String, String)>,
}

impl Rendered {
    /// One text.
    pub fn text(text: String) -> Rendered {
        Rendered {
            files: vec![(String::new(), text)],
        }
    }

    /// Everything as one text: several files each under a `# name` line.
    pub fn joined(&self) -> String {
        match self.files.as_slice() {
            [(_, text)] => text.clone(),
            files => files
                .iter()
                .map(|(name, text)| format!("# {name}\n{text}"))
                .collect::<Vec<_>>()
                .join("\n"),
        }
    }
}

/// Write `rendered` to `output` (a file, or for several files a directory created if
/// needed), or print it. Returns the paths written.
pub fn emit(rendered: &Rendered, output: Option<&Path>) -> Result<Vec<PathBuf>, AppError> {
    match (output, rendered.files.as_slice()) {
        (None, _) => {
            write_stdout(&rendered.joined())?;
            Ok(Vec::new())
        }
        (Some(path), [(_, text)]) => {
            write_output(path, text)?;
            Ok(vec![path.to_path_buf()])
        }
        (Some(dir), files) => {
            std::fs::create_dir_all(dir).map_err(|source| AppError::Write {
                path: dir.display().to_string(),
                source,
            })?;
            let mut written = Vec::new();
            for (name, text) in files {
                let p = dir.join(name);
                write_output(&p, text)?;
                written.push(p);
            }
            Ok(written)
        }
    }
}

/// Write `text` to `path` whole or not at all: written to a temporary file beside it
/// (named after the process, so that two runs do not share it), flushed to disk, then
/// renamed over it.
pub fn write_output(path: &Path, text: &str) -> Result<(), AppError> {
    write_output_with(path, |w| {
        use std::io::Write;
        w.write_all(text.as_bytes())
    })
}

/// Write to `path` whole or not at all, as [`write_output`] does, with `write` producing
/// the content straight into the temporary file.
pub fn write_output_with(
    path: &Path,
    write: impl FnOnce(&mut std::fs::File) -> std::io::Result<()>,
) -> Result<(), AppError> {
    write_atomically(path, write).map_err(|source| AppError::Write {
        path: path.display().to_string(),
        source,
    })
}

/// Write to `path` through a temporary file beside it, flushed to disk and renamed over
/// it; the temporary file is removed if anything fails.
fn write_atomically(
    path: &Path,
    write: impl FnOnce(&mut std::fs::File) -> io::Result<()>,
) -> io::Result<()> {
    let name = path
        .file_name()
        .map(|n| n.to_string_lossy().into_owned())
        .unwrap_or_default();
    let tmp = path.with_file_name(format!(".{name}.{}.partial", std::process::id()));
    let written = std::fs::File::create(&tmp).and_then(|mut f| {
        write(&mut f)?;
        f.sync_all()
    });
    if let Err(e) = written {
        let _ = std::fs::remove_file(&tmp);
        return Err(e);
    }
    std::fs::rename(&tmp, path).inspect_err(|_| {
        let _ = std::fs::remove_file(&tmp);
    })
}

/// Print `text` on standard output. A reader that stops early (`plumbline check … | head`)
/// is not an error.
pub fn write_stdout(text: &str) -> Result<(), AppError> {
    stdout_with(|out| {
        use std::io::Write;
        out.write_all(text.as_bytes())
    })
}

/// Print on standard output what `write` produces. A reader that stops early is not an
/// error.
pub fn stdout_with(
    write: impl FnOnce(&mut std::io::StdoutLock<'static>) -> std::io::Result<()>,
) -> Result<(), AppError> {
    print_with(write).map_err(|source| AppError::Write {
        path: STDOUT.into(),
        source,
    })
}

/// How errors name standard output.
const STDOUT: &str = "standard output";

/// [`stdout_with`] with the bare error.
fn print_with(
    write: impl FnOnce(&mut std::io::StdoutLock<'static>) -> io::Result<()>,
) -> io::Result<()> {
    use std::io::Write;
    let mut out = std::io::stdout().lock();
    match write(&mut out).and_then(|()| out.flush()) {
        Err(e) if e.kind() != io::ErrorKind::BrokenPipe => Err(e),
        _ => Ok(()),
    }
}

/// Where a command's document goes, as an export [`Sink`]. With an output path, a document
/// that is one stream goes to that file, and a document of several files into that
/// directory (created if needed); each file is written straight from the exporter, whole or
/// not at all ([`write_output_with`]). Without one, a stream goes straight to standard
/// output, and several files are printed together by [`Destination::finish`], each under a
/// `# name` line ([`Rendered::joined`]).
pub struct Destination<'a> {
    output: Option<&'a Path>,
    written: Vec<PathBuf>,
    /// Files bound for standard output.
    held: Memory,
}

impl<'a> Destination<'a> {
    /// A destination: `output` (`-o`), else standard output.
    pub fn new(output: Option<&'a Path>) -> Destination<'a> {
        Destination {
            output,
            written: Vec::new(),
            held: Memory::default(),
        }
    }

    /// Print what is held for standard output; the paths written.
    pub fn finish(self) -> Result<Vec<PathBuf>, AppError> {
        if !self.held.files.is_empty() {
            write_stdout(
                &Rendered {
                    files: self.held.files,
                }
                .joined(),
            )?;
        }
        Ok(self.written)
    }
}

/// The error of writing `path`.
fn failed(path: &Path) -> impl FnOnce(io::Error) -> ExportError {
    let path = path.display().to_string();
    move |source| ExportError::Write { path, source }
}

impl Sink for Destination<'_> {
    fn part(
        &mut self,
        name: &str,
        write: &mut dyn FnMut(&mut dyn io::Write) -> io::Result<()>,
    ) -> Result<(), ExportError> {
        let path = match (self.output, name.is_empty()) {
            (None, true) => {
                return print_with(|out| write(out)).map_err(|source| ExportError::Write {
                    path: STDOUT.into(),
                    source,
                });
            }
            (None, false) => return self.held.part(name, write),
            (Some(file), true) => file.to_path_buf(),
            (Some(dir), false) => {
                if self.written.is_empty() {
                    std::fs::create_dir_all(dir).map_err(failed(dir))?;
                }
                dir.join(name)
            }
        };
        write_atomically(&path, |f| write(f)).map_err(failed(&path))?;
        self.written.push(path);
        Ok(())
    }
}
