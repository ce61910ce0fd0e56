//! Factor arithmetic: numbers, parameter names, `+ - * /` and parentheses.
//!
//! A load factor in a combination table is either a plain number or a short expression of the
//! table's named parameters, e.g. `"1.2 + 0.2*s_ds"` or `"psi0_w * gamma_q"`. Expressions are
//! parsed once when the table is read (so a typo is reported with its line and column) and
//! evaluated when factored cases are generated (so overrides apply).

use std::collections::{BTreeMap, BTreeSet};

/// A parsed factor expression.
#[derive(Debug, Clone, PartialEq)]
pub enum Expr {
    /// A literal number.
    Num(f64),
    /// A parameter name.
    Param(String),
    /// Unary minus.
    Neg(Box<Expr>),
    /// A binary operation.
    Bin(Op, Box<Expr>, Box<Expr>),
}

/// A binary operator.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Op {
    Add,
    Sub,
    Mul,
    Div,
}

/// A syntax error at a byte offset of the expression text.
#[derive(Debug, Clone, PartialEq)]
pub struct ExprError {
    /// Byte offset in the expression text.
    pub offset: usize,
    /// What was wrong and what was expected.
    pub message: String,
}

/// Why an expression could not be evaluated.
#[derive(Debug, Clone, PartialEq)]
pub enum EvalError {
    /// A parameter has no value (no default and no override).
    Unset(String),
    /// A parameter name is not known at all.
    Unknown(String),
    /// Division by zero or another non-finite result.
    NotFinite,
}

/// The longest factor expression accepted, in bytes. A load factor is a short formula
/// (`"1.2 + 0.2*s_ds"`); the limit bounds the work and the depth of the parsed tree.
pub const MAX_EXPR_LEN: usize = 256;

/// The deepest nesting of parentheses and unary signs accepted in a factor expression.
pub const MAX_EXPR_DEPTH: usize = 16;

impl Expr {
    /// Parse an expression; the whole text must be consumed. Expressions longer than
    /// [`MAX_EXPR_LEN`] bytes or nested deeper than [`MAX_EXPR_DEPTH`] are refused, so the
    /// work (and the recursion) is bounded whatever the input.
    pub fn parse(text: &str) -> Result<Expr, ExprError> {
        if text.len() > MAX_EXPR_LEN {
            return Err(ExprError {
                offset: MAX_EXPR_LEN,
                message: format!(
                    "the expression is {} bytes long; a factor expression is limited to {MAX_EXPR_LEN}",
                    text.len()
                ),
            });
        }
        let mut p = Parser {
            s: text.as_bytes(),
            pos: 0,
            depth: 0,
        };
        let e = p.expr()?;
        p.skip_ws();
        if p.pos < p.s.len() {
            return Err(p.error("expected an operator (+ - * /) or the end of the expression"));
        }
        Ok(e)
    }

    /// Parameter names used by the expression, each once, in sorted order.
    pub fn params(&self) -> BTreeSet<String> {
        let mut out = BTreeSet::new();
        self.collect(&mut out);
        out
    }

    fn collect(&self, out: &mut BTreeSet<String>) {
        match self {
            Expr::Num(_) => {}
            Expr::Param(n) => {
                out.insert(n.clone());
            }
            Expr::Neg(a) => a.collect(out),
            Expr::Bin(_, a, b) => {
                a.collect(out);
                b.collect(out);
            }
        }
    }

    /// Evaluate with parameter values; `None` marks a declared parameter without a value.
    pub fn eval(&self, values: &BTreeMap<String, Option<f64>>) -> Result<f64, EvalError> {
        let v = match self {
            Expr::Num(x) => *x,
            Expr::Param(n) => match values.get(n) {
                Some(Some(x)) => *x,
                Some(None) => return Err(EvalError::Unset(n.clone())),
                None => return Err(EvalError::Unknown(n.clone())),
            },
            Expr::Neg(a) => -a.eval(values)?,
            Expr::Bin(op, a, b) => {
                let (x, y) = (a.eval(values)?, b.eval(values)?);
                match op {
                    Op::Add => x + y,
                    Op::Sub => x - y,
                    Op::Mul => x * y,
                    Op::Div => x / y,
                }
            }
        };
        if v.is_finite() {
            Ok(v)
        } else {
            Err(EvalError::NotFinite)
        }
    }

    /// The constant value when the expression uses no parameter.
    pub fn constant(&self) -> Option<f64> {
        if self.params().is_empty() {
            self.eval(&BTreeMap::new()).ok()
        } else {
            None
        }
    }
}

struct Parser<'a> {
    s: &'a [u8],
    pos: usize,
    /// Current nesting of parentheses and unary signs.
    depth: usize,
}

impl Parser<'_> {
    fn error(&self, message: &str) -> ExprError {
        ExprError {
            offset: self.pos,
            message: message.to_string(),
        }
    }

    fn skip_ws(&mut self) {
        while self.pos < self.s.len() && self.s[self.pos].is_ascii_whitespace() {
            self.pos += 1;
        }
    }

    fn peek(&mut self) -> Option<u8> {
        self.skip_ws();
        self.s.get(self.pos).copied()
    }

    /// expr := term (('+' | '-') term)*
    fn expr(&mut self) -> Result<Expr, ExprError> {
        let mut left = self.term()?;
        while let Some(c @ (b'+' | b'-')) = self.peek() {
            self.pos += 1;
            let right = self.term()?;
            let op = if c == b'+' { Op::Add } else { Op::Sub };
            left = Expr::Bin(op, Box::new(left), Box::new(right));
        }
        Ok(left)
    }

    /// term := unary (('*' | '/') unary)*
    fn term(&mut self) -> Result<Expr, ExprError> {
        let mut left = self.unary()?;
        while let Some(c @ (b'*' | b'/')) = self.peek() {
            self.pos += 1;
            let right = self.unary()?;
            let op = if c == b'*' { Op::Mul } else { Op::Div };
            left = Expr::Bin(op, Box::new(left), Box::new(right));
        }
        Ok(left)
    }

    /// unary := ('-' | '+') unary | number | name | '(' expr ')'
    fn unary(&mut self) -> Result<Expr, ExprError> {
        self.depth += 1;
        if self.depth > MAX_EXPR_DEPTH {
            return Err(self.error(&format!(
                "the expression is nested more than {MAX_EXPR_DEPTH} levels deep (parentheses and signs)"
            )));
        }
        let e = self.unary_inner();
        self.depth -= 1;
        e
    }

    fn unary_inner(&mut self) -> Result<Expr, ExprError> {
        match self.peek() {
            Some(b'-') => {
                self.pos += 1;
                Ok(Expr::Neg(Box::new(self.unary()?)))
            }
            Some(b'+') => {
                self.pos += 1;
                self.unary()
            }
            Some(b'(') => {
                self.pos += 1;
                let e = self.expr()?;
                if self.peek() != Some(b')') {
                    return Err(self.error("expected `)`"));
                }
                self.pos += 1;
                Ok(e)
            }
            Some(c) if c.is_ascii_digit() || c == b'.' => self.number(),
            Some(c) if c.is_ascii_alphabetic() || c == b'_' => {
                let start = self.pos;
                while self.pos < self.s.len()
                    && (self.s[self.pos].is_ascii_alphanumeric() || self.s[self.pos] == b'_')
                {
                    self.pos += 1;
                }
                let name = String::from_utf8_lossy(&self.s[start..self.pos]).into_owned();
                Ok(Expr::Param(name))
            }
            Some(_) => Err(self.error("expected a number, a parameter name or `(`")),
            None => {
                Err(self.error("expression ends too early: expected a number or a parameter name"))
            }
        }
    }

    fn number(&mut self) -> Result<Expr, ExprError> {
        let start = self.pos;
        let digits = |p: &mut Parser| {
            while p.pos < p.s.len() && p.s[p.pos].is_ascii_digit() {
                p.pos += 1;
            }
        };
        digits(self);
        if self.s.get(self.pos) == Some(&b'.') {
            self.pos += 1;
            digits(self);
        }
        if matches!(self.s.get(self.pos), Some(b'e' | b'E')) {
            self.pos += 1;
            if matches!(self.s.get(self.pos), Some(b'+' | b'-')) {
                self.pos += 1;
            }
            digits(self);
        }
        let text = std::str::from_utf8(&self.s[start..self.pos]).unwrap_or("");
        text.parse::<f64>().map(Expr::Num).map_err(|_| ExprError {
            offset: start,
            message: format!("`{text}` is not a number"),
        })
    }
}

/// Find a cycle among parameters: `deps` maps each parameter to the ones its default uses.
/// Returns the cycle as a path `a → b → … → a` when there is one.
pub fn find_cycle(deps: &BTreeMap<String, BTreeSet<String>>) -> Option<Vec<String>> {
    // Colours: absent = unvisited, false = on the stack, true = done.
    fn visit(
        n: &str,
        deps: &BTreeMap<String, BTreeSet<String>>,
        state: &mut BTreeMap<String, bool>,
        stack: &mut Vec<String>,
    ) -> Option<Vec<String>> {
        match state.get(n) {
            Some(true) => return None,
            Some(false) => {
                let from = stack.iter().position(|s| s == n).unwrap_or(0);
                let mut cycle = stack[from..].to_vec();
                cycle.push(n.to_string());
                return Some(cycle);
            }
            None => {}
        }
        state.insert(n.to_string(), false);
        stack.push(n.to_string());
        for d in deps.get(n).into_iter().flatten() {
            if deps.contains_key(d)
                && let Some(c) = visit(d, deps, state, stack)
            {
                return Some(c);
            }
        }
        stack.pop();
        state.insert(n.to_string(), true);
        None
    }
    let mut state = BTreeMap::new();
    let mut stack = Vec::new();
    deps.keys()
        .find_map(|k| visit(k, deps, &mut state, &mut stack))
}

/// Values of all parameters: overrides first, then defaults evaluated in dependency order.
/// A parameter whose default is absent, or uses a parameter without value, maps to `None`.
/// `defaults` must be free of cycles (see [`find_cycle`]).
pub fn resolve(
    defaults: &BTreeMap<String, Option<Expr>>,
    overrides: &BTreeMap<String, f64>,
) -> BTreeMap<String, Option<f64>> {
    let mut out: BTreeMap<String, Option<f64>> = BTreeMap::new();
    fn value_of(
        n: &str,
        defaults: &BTreeMap<String, Option<Expr>>,
        overrides: &BTreeMap<String, f64>,
        out: &mut BTreeMap<String, Option<f64>>,
        depth: usize,
    ) -> Option<f64> {
        if let Some(v) = out.get(n) {
            return *v;
        }
        let v = if let Some(x) = overrides.get(n) {
            Some(*x)
        } else if depth > defaults.len() {
            None // guards against a cycle that slipped through
        } else {
            match defaults.get(n) {
                Some(Some(e)) => {
                    let mut vals = BTreeMap::new();
                    for p in e.params() {
                        vals.insert(p.clone(), value_of(&p, defaults, overrides, out, depth + 1));
                    }
                    e.eval(&vals).ok()
                }
                _ => None,
            }
        };
        out.insert(n.to_string(), v);
        v
    }
    for n in defaults.keys() {
        value_of(n, defaults, overrides, &mut out, 0);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;

    fn vals(pairs: &[(&str, f64)]) -> BTreeMap<String, Option<f64>> {
        pairs
            .iter()
            .map(|(k, v)| (k.to_string(), Some(*v)))
            .collect()
    }

    #[test]
    fn precedence_and_parentheses() {
        // Arithmetic identities, closed form.
        let e = Expr::parse("1.2 + 0.2*s_ds").unwrap();
        assert!((e.eval(&vals(&[("s_ds", 1.0)])).unwrap() - 1.4).abs() < 1e-12);
        let e = Expr::parse("(1 - 2) * -3 / 2").unwrap();
        assert_eq!(e.eval(&BTreeMap::new()).unwrap(), 1.5);
        assert_eq!(Expr::parse("1e-1").unwrap().constant(), Some(0.1));
    }

    #[test]
    fn syntax_errors_have_offsets() {
        assert_eq!(Expr::parse("1.2 +").unwrap_err().offset, 5);
        assert_eq!(Expr::parse("1.2 x").unwrap_err().offset, 4);
        assert_eq!(Expr::parse("(1").unwrap_err().offset, 2);
        assert_eq!(Expr::parse("1 $ 2").unwrap_err().offset, 2);
    }

    #[test]
    fn nesting_and_length_are_bounded() {
        // Bounded work: 20 000 parentheses used to overflow the stack.
        let deep = format!("{}1{}", "(".repeat(20_000), ")".repeat(20_000));
        let e = Expr::parse(&deep).unwrap_err();
        assert!(e.message.contains("limited to"), "{}", e.message);
        let nested = format!("{}1{}", "(".repeat(40), ")".repeat(40));
        assert!(Expr::parse(&nested).unwrap_err().message.contains("nested"));
        let signs = format!("{}1", "-".repeat(40));
        assert!(Expr::parse(&signs).unwrap_err().message.contains("nested"));
        let ok = format!("{}1{}", "(".repeat(10), ")".repeat(10));
        assert_eq!(Expr::parse(&ok).unwrap().constant(), Some(1.0));
    }

    #[test]
    fn cycles_are_found() {
        let mut d: BTreeMap<String, BTreeSet<String>> = BTreeMap::new();
        d.insert("a".into(), ["b".to_string()].into());
        d.insert("b".into(), ["c".to_string()].into());
        d.insert("c".into(), ["a".to_string()].into());
        let c = find_cycle(&d).unwrap();
        assert_eq!(c.first(), c.last());
        assert_eq!(c.len(), 4);
        d.insert("c".into(), BTreeSet::new());
        assert!(find_cycle(&d).is_none());
    }

    #[test]
    fn resolve_uses_overrides_then_defaults() {
        let mut d = BTreeMap::new();
        d.insert("g".to_string(), Some(Expr::parse("1.5").unwrap()));
        d.insert("psi".to_string(), Some(Expr::parse("0.6").unwrap()));
        d.insert("comp".to_string(), Some(Expr::parse("psi*g").unwrap()));
        d.insert("sds".to_string(), None);
        let v = resolve(&d, &BTreeMap::from([("psi".to_string(), 0.7)]));
        assert!((v["comp"].unwrap() - 1.05).abs() < 1e-12);
        assert_eq!(v["sds"], None);
    }
}
