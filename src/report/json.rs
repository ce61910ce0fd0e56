//! A JSON object written to its destination section by section, as pretty-printed as
//! `serde_json::to_string_pretty` would print it whole, but never held whole in memory: a
//! report of a tall frame runs to a hundred megabytes and more.
//!
//! Each top-level key is one call, [`JsonObject::section`], with any `Serialize` value. A
//! new section of a report is one more call in the function that writes that report (for
//! `check`, [`super::summary::write_json`]).

use std::io::{self, Write};

use serde::Serialize;
use serde_json::ser::{Formatter, Serializer};

/// serde_json's pretty layout (`PrettyFormatter`: two spaces a level, `": "` after a key)
/// for a value that sits one level deep, under a top-level key: every line break is
/// followed by the indentation of its level plus one, written in one piece rather than a
/// piece per level. JSON strings never contain a raw line break (it is escaped), so the
/// layout is the whole value's as `serde_json::to_string_pretty` prints it.
struct Nested {
    /// Nesting level of what is being written, the top-level object's members at 1.
    level: usize,
    has_value: bool,
}

/// A line break and up to [`Nested::MAX_ONE_PIECE`] levels of indentation.
const BREAK: [u8; 129] = {
    let mut b = [b' '; 129];
    b[0] = b'\n';
    b
};

impl Nested {
    /// Levels whose line break and indentation go in one write.
    const MAX_ONE_PIECE: usize = (BREAK.len() - 1) / 2;

    /// A line break and the indentation of the current level.
    fn line<W: ?Sized + Write>(&self, w: &mut W) -> io::Result<()> {
        let mut level = self.level;
        let first = level.min(Self::MAX_ONE_PIECE);
        w.write_all(&BREAK[..1 + 2 * first])?;
        level -= first;
        while level > 0 {
            let more = level.min(Self::MAX_ONE_PIECE);
            w.write_all(&BREAK[1..1 + 2 * more])?;
            level -= more;
        }
        Ok(())
    }
}

impl Nested {
    /// Open an array or object: one level deeper, nothing in it yet.
    fn open<W: ?Sized + Write>(&mut self, w: &mut W, bracket: &[u8]) -> io::Result<()> {
        self.level += 1;
        self.has_value = false;
        w.write_all(bracket)
    }

    /// Close it: back a level, on a line of its own unless it is empty.
    fn close<W: ?Sized + Write>(&mut self, w: &mut W, bracket: &[u8]) -> io::Result<()> {
        self.level -= 1;
        if self.has_value {
            self.line(w)?;
        }
        w.write_all(bracket)
    }

    /// An element or key on a line of its own, after a comma unless it is the first.
    fn item<W: ?Sized + Write>(&mut self, w: &mut W, first: bool) -> io::Result<()> {
        if !first {
            w.write_all(b",")?;
        }
        self.line(w)
    }
}

impl Formatter for Nested {
    fn begin_array<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        self.open(w, b"[")
    }

    fn end_array<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        self.close(w, b"]")
    }

    fn begin_array_value<W: ?Sized + Write>(&mut self, w: &mut W, first: bool) -> io::Result<()> {
        self.item(w, first)
    }

    fn end_array_value<W: ?Sized + Write>(&mut self, _: &mut W) -> io::Result<()> {
        self.has_value = true;
        Ok(())
    }

    fn begin_object<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        self.open(w, b"{")
    }

    fn end_object<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        self.close(w, b"}")
    }

    fn begin_object_key<W: ?Sized + Write>(&mut self, w: &mut W, first: bool) -> io::Result<()> {
        self.item(w, first)
    }

    fn begin_object_value<W: ?Sized + Write>(&mut self, w: &mut W) -> io::Result<()> {
        w.write_all(b": ")
    }

    fn end_object_value<W: ?Sized + Write>(&mut self, _: &mut W) -> io::Result<()> {
        self.has_value = true;
        Ok(())
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
        let nested = Nested {
            level: 1,
            has_value: false,
        };
        let mut ser = Serializer::with_formatter(&mut self.out, nested);
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
        // Deeper than one piece of indentation holds (70 levels).
        let mut deep = serde_json::json!([1, {"k": "v"}]);
        for _ in 0..70 {
            deep = serde_json::json!([deep, 2]);
        }
        let mut doc = JsonObject::begin(Vec::new()).unwrap();
        doc.section("deep", &deep).unwrap();
        let text = String::from_utf8(doc.finish().unwrap()).unwrap();
        let whole = serde_json::json!({"deep": deep});
        assert_eq!(text, serde_json::to_string_pretty(&whole).unwrap() + "\n");
    }
}
