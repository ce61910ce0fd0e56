//! The invented bench frame shared by the benchmarks (illustrative sections, not a design):
//! `bays` bays of 8 m and `stories` storeys of 4 m, fixed bases, steel columns and beams,
//! dead load (self-weight plus 20 kN/m on every beam), live load 10 kN/m on every beam,
//! and wind of 10 kN at every level from the left (WL) or the right (WR).
//! Also the process's own CPU time and peak memory, for the benches that print them.
#![allow(dead_code)]

/// Peak resident memory of this process, MB (Linux `VmHWM`; 0 elsewhere).
pub fn peak_mb() -> f64 {
    std::fs::read_to_string("/proc/self/status")
        .ok()
        .and_then(|s| {
            s.lines()
                .find(|l| l.starts_with("VmHWM:"))
                .and_then(|l| l.split_whitespace().nth(1))
                .and_then(|v| v.parse::<f64>().ok())
        })
        .map_or(0.0, |kb| kb / 1024.0)
}

/// CPU time (user + system) of this process so far, s (Linux `/proc/self/stat`, 100
/// ticks per second; 0 elsewhere). On a shared machine it is steadier than the wall clock.
pub fn cpu_s() -> f64 {
    std::fs::read_to_string("/proc/self/stat")
        .ok()
        .and_then(|s| {
            // Fields after the command name (which ends with ')'): utime is the 12th and
            // stime the 13th of them.
            let rest = s.rsplit_once(')')?.1;
            let f: Vec<&str> = rest.split_whitespace().collect();
            let ticks = f.get(11)?.parse::<f64>().ok()? + f.get(12)?.parse::<f64>().ok()?;
            Some(ticks / 100.0)
        })
        .unwrap_or(0.0)
}

/// The model file of the bench frame titled `title`; with `arrange`, its live load is
/// arranged span by span (`arrange = true`).
pub fn frame_text(title: &str, bays: usize, stories: usize, arrange: bool) -> String {
    frame_text_with(title, bays, stories, arrange, false)
}

/// [`frame_text`]; with `distinct`, no two storeys alike: storey k has columns and beams of
/// their own sections (A and I growing by 0.03 % and 0.02 % a storey) and a height from
/// 3.6 m stepping 0.05 m through a cycle of 17, so that no two members share a section and
/// a length (the frame for which no stiffness is shared).
pub fn frame_text_with(
    title: &str,
    bays: usize,
    stories: usize,
    arrange: bool,
    distinct: bool,
) -> String {
    let list = |n: usize, v: f64| vec![format!("{v}"); n].join(", ");
    let arranged = if arrange { "arrange = true\n" } else { "" };
    let (sections, columns, beams, heights) = if distinct {
        let mut sections = String::new();
        for k in 0..stories {
            sections += &format!(
                "[[section]]\nid = \"C{k}\"\nA = \"{} mm^2\"\nI = \"{:e} mm^4\"\nrole = \"column\"\n\
                 [[section]]\nid = \"B{k}\"\nA = \"{} mm^2\"\nI = \"{:e} mm^4\"\nrole = \"beam\"\n",
                20000 + 6 * k,
                4.0e8 * (1.0 + 0.0003 * k as f64),
                10000 + 2 * k,
                5.0e8 * (1.0 + 0.0002 * k as f64),
            );
        }
        let ids = |p: &str| {
            (0..stories)
                .map(|k| format!("\"{p}{k}\""))
                .collect::<Vec<_>>()
                .join(", ")
        };
        let heights = (0..stories)
            .map(|k| format!("{:.2}", 3.6 + 0.05 * (k % 17) as f64))
            .collect::<Vec<_>>()
            .join(", ");
        (sections, ids("C"), ids("B"), heights)
    } else {
        (
            "[[section]]\nid = \"COL\"\nA = \"20000 mm^2\"\nI = \"4.0e8 mm^4\"\nrole = \"column\"\n\
             [[section]]\nid = \"BM\"\nA = \"10000 mm^2\"\nI = \"5.0e8 mm^4\"\nrole = \"beam\"\n"
                .to_string(),
            "\"COL\"".to_string(),
            "\"BM\"".to_string(),
            list(stories, 4.0),
        )
    };
    format!(
        r#"title = "{title} {bays} x {stories}"
units = "kN-m"
[[material]]
id = "S"
E = "200 GPa"
unit_weight = "77 kN/m^3"
{sections}[frame]
bays = [{}]
stories = [{heights}]
base = "fixed"
material = "S"
columns = [{columns}]
beams = [{beams}]
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
{arranged}[[case.member_load]]
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
        bays + 1,
    )
}
