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
    let list = |n: usize, v: f64| vec![format!("{v}"); n].join(", ");
    let arranged = if arrange { "arrange = true\n" } else { "" };
    format!(
        r#"title = "{title} {bays} x {stories}"
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
        list(stories, 4.0),
        bays + 1,
    )
}
