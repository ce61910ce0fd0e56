//! No model file makes plumbline panic: mutated copies of the shipped examples either fail
//! with a located error or run through `solve` and `check` to the end.
//! (common practice, no source: mutation testing of an input reader)

use std::panic::{AssertUnwindSafe, catch_unwind};

use plumbline::app::{CheckArgs, check, solve};
use plumbline::input::parse_model;
use plumbline::report::OutputFormat;

/// Deterministic pseudo-random numbers (SplitMix64).
struct Rng(u64);

impl Rng {
    fn next(&mut self) -> u64 {
        self.0 = self.0.wrapping_add(0x9E37_79B9_7F4A_7C15);
        let mut z = self.0;
        z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
        z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
        z ^ (z >> 31)
    }
    fn below(&mut self, n: usize) -> usize {
        (self.next() % n.max(1) as u64) as usize
    }
}

const REPLACEMENTS: &[&str] = &[
    "0",
    "-1",
    "1e308",
    "-1e-300",
    "nan",
    "inf",
    "\"\"",
    "\"0 m\"",
    "\"1 kN\"",
    "\"-5 kN/m\"",
    "[]",
    "{}",
    "\"N1.1\"",
    "\"*\"",
    "true",
    "\"both\"",
    "\"fixed\"",
    "3",
];

/// One mutation of `text`: replace a value, delete a line, duplicate a line or swap two.
fn mutate(text: &str, rng: &mut Rng) -> String {
    let mut lines: Vec<String> = text.lines().map(str::to_string).collect();
    let k = rng.below(lines.len());
    match rng.below(4) {
        0 => {
            if let Some(eq) = lines[k].find('=') {
                let r = REPLACEMENTS[rng.below(REPLACEMENTS.len())];
                lines[k] = format!("{}= {r}", &lines[k][..eq]);
            }
        }
        1 => {
            lines.remove(k);
        }
        2 => {
            let l = lines[k].clone();
            lines.insert(k, l);
        }
        _ => {
            let j = rng.below(lines.len());
            lines.swap(k, j);
        }
    }
    lines.join("\n")
}

#[test]
fn mutated_examples_never_panic() {
    let dir = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("examples");
    let tmp = std::env::temp_dir().join(format!("plumbline-robust-{}", std::process::id()));
    std::fs::create_dir_all(&tmp).unwrap();
    let mut rng = Rng(2026);
    let mut ran = 0;
    for entry in std::fs::read_dir(&dir).unwrap() {
        let path = entry.unwrap().path();
        if path.extension().is_none_or(|e| e != "toml") {
            continue;
        }
        let text = std::fs::read_to_string(&path).unwrap();
        for round in 0..30 {
            let mut m = text.clone();
            for _ in 0..(1 + round % 3) {
                m = mutate(&m, &mut rng);
            }
            let file = tmp.join(path.file_name().unwrap());
            std::fs::write(&file, &m).unwrap();
            let outcome = catch_unwind(AssertUnwindSafe(|| {
                if let Ok(model) = parse_model(&m, "mutant.toml") {
                    for case in &model.load_cases {
                        let _ = solve(&file, &case.id, OutputFormat::Json);
                    }
                    let args = CheckArgs {
                        sets: vec!["s_ds=0.5".into()],
                        ..Default::default()
                    };
                    let _ = check(&file, &args);
                    true
                } else {
                    false
                }
            }));
            match outcome {
                Ok(true) => ran += 1,
                Ok(false) => {}
                Err(_) => panic!("panicked on a mutant of {}:\n{m}", path.display()),
            }
        }
    }
    let _ = std::fs::remove_dir_all(&tmp);
    assert!(ran > 0, "no mutant got as far as the analysis");
}
