//! A JSON object written to its destination section by section, as pretty-printed as
//! `serde_json::to_string_pretty` would print it whole, but never held whole in memory: a
//! report of a tall frame runs to a hundred megabytes and more.
//!
//! Each top-level key is one call, [`JsonObject::section`], with any `Serialize` value. A
//! new section of a report is one more call in the function that writes that report (for
//! `check`, [`super::summary::write_json`]).

use std::io::{self, Write};

use serde::Serialize;
use serde_json::ser::{PrettyFormatter, Serializer};

/// A writer that indents every line after the first by one level (two spaces), so that a
/// value pretty-printed on its own nests under a top-level key. JSON strings never contain
/// a raw line break (it is escaped), so every `\n` written is a line break of the layout.
struct Indented<W: Write> {
    out: W,
}

impl<W: Write> Write for Indented<W> {
    fn write(&mut self, buf: &[u8]) -> io::Result<usize> {
        let mut rest = buf;
        while let Some(at) = rest.iter().position(|&b| b == b'\n') {
            self.out.write_all(&rest[..=at])?;
            self.out.write_all(b"  ")?;
            rest = &rest[at + 1..];
        }
        self.out.write_all(rest)?;
        Ok(buf.len())
    }

    fn flush(&mut self) -> io::Result<()> {
        self.out.flush()
    }
}

/// A JSON object being written to `W`: [`JsonObject::begin`], one
/// [`JsonObject::section`] per key, then [`JsonObject::finish`].
pub struct JsonObject<W: Write> {
    out: W,
    first: bool,
}

impl<W: Write> JsonObject<W> {
    /// Start the object (writes `{`).
    pub fn begin(mut out: W) -> io::Result<JsonObject<W>> {
        out.write_all(b"{")?;
        Ok(JsonObject { out, first: true })
    }

    /// Write one key and its value, pretty-printed, straight to the destination.
    pub fn section<T: Serialize + ?Sized>(&mut self, key: &str, value: &T) -> io::Result<()> {
        let lead: &[u8] = if self.first { b"\n  " } else { b",\n  " };
        self.first = false;
        self.out.write_all(lead)?;
        serde_json::to_writer(&mut self.out, key)?;
        self.out.write_all(b": ")?;
        let mut ser =
            Serializer::with_formatter(Indented { out: &mut self.out }, PrettyFormatter::new());
        value.serialize(&mut ser).map_err(io::Error::from)
    }

    /// Close the object (with a final line break) and return the destination, flushed.
    pub fn finish(mut self) -> io::Result<W> {
        self.out
            .write_all(if self.first { b"}\n" } else { b"\n}\n" })?;
        self.out.flush()?;
        Ok(self.out)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Section by section gives the text `serde_json::to_string_pretty` gives for the
    /// whole object (closed form: the same layout rules, applied once).
    #[test]
    fn sections_print_as_the_whole_object_would() {
        let nested = serde_json::json!({"b": [1.5, {"c": null}], "d": "line\nbreak", "e": []});
        let whole = serde_json::json!({"a": 1, "nested": nested, "z": {}});
        let mut doc = JsonObject::begin(Vec::new()).unwrap();
        doc.section("a", &1).unwrap();
        doc.section("nested", &nested).unwrap();
        doc.section("z", &serde_json::json!({})).unwrap();
        let text = String::from_utf8(doc.finish().unwrap()).unwrap();
        assert_eq!(text, serde_json::to_string_pretty(&whole).unwrap() + "\n");
        let empty = JsonObject::begin(Vec::new()).unwrap().finish().unwrap();
        assert_eq!(empty, b"{}\n");
    }
}
