//! A small expression language that is both evaluated and rendered.
//!
//! Every code formula is written once as text such as
//! `P*R/(S*E - 0.6*P)`. The same parsed tree produces the number (with
//! dimensions checked on every operation), the symbolic form shown in the
//! report (`P·R/(S·E − 0.6·P)`) and the substituted form
//! (`1 MPa · 903 mm/(…)`), so the three can never drift apart.

use crate::units::{format_number, Dim, Quantity, UnitSystem};
use std::collections::BTreeMap;
use std::fmt;

/// A parsed expression.
#[derive(Debug, Clone, PartialEq)]
pub enum Expr {
    /// A literal number (dimensionless).
    Num(f64, String),
    /// A named symbol looked up in the environment.
    Var(String),
    /// Negation.
    Neg(Box<Expr>),
    /// A binary operation.
    Bin(Op, Box<Expr>, Box<Expr>),
    /// A function call.
    Call(Func, Vec<Expr>),
}

/// Binary operators.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Op {
    /// Addition.
    Add,
    /// Subtraction.
    Sub,
    /// Multiplication.
    Mul,
    /// Division.
    Div,
    /// Power with a literal exponent.
    Pow,
}

/// Built-in functions.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Func {
    /// Square root.
    Sqrt,
    /// Cube root.
    Cbrt,
    /// Cosine of an angle.
    Cos,
    /// Sine of an angle.
    Sin,
    /// Tangent of an angle.
    Tan,
    /// Arc tangent, giving an angle.
    Atan,
    /// Smaller of two values of the same dimension.
    Min,
    /// Larger of two values of the same dimension.
    Max,
}

impl Func {
    fn from_name(name: &str) -> Option<Func> {
        Some(match name {
            "sqrt" => Func::Sqrt,
            "cbrt" => Func::Cbrt,
            "cos" => Func::Cos,
            "sin" => Func::Sin,
            "tan" => Func::Tan,
            "atan" => Func::Atan,
            "min" => Func::Min,
            "max" => Func::Max,
            _ => return None,
        })
    }
    fn arity(self) -> usize {
        match self {
            Func::Min | Func::Max => 2,
            _ => 1,
        }
    }
    fn name(self) -> &'static str {
        match self {
            Func::Sqrt => "√",
            Func::Cbrt => "∛",
            Func::Cos => "cos",
            Func::Sin => "sin",
            Func::Tan => "tan",
            Func::Atan => "atan",
            Func::Min => "min",
            Func::Max => "max",
        }
    }
}

/// An error in a formula: a programming error in a rule, never a user error,
/// which is why tests evaluate every formula.
#[derive(Debug, Clone, PartialEq)]
pub struct ExprError(pub String);

impl fmt::Display for ExprError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.0)
    }
}

/// Parses formula text. Grammar: sums of products of powers of atoms; atoms
/// are numbers, symbols, function calls and parenthesised expressions.
pub fn parse(text: &str) -> Result<Expr, ExprError> {
    let tokens = tokenize(text)?;
    let mut p = Parser { tokens, pos: 0 };
    let e = p.sum()?;
    if p.pos != p.tokens.len() {
        return Err(ExprError(format!("unexpected `{:?}` in `{text}`", p.tokens[p.pos])));
    }
    Ok(e)
}

#[derive(Debug, Clone, PartialEq)]
enum Tok {
    Num(f64, String),
    Ident(String),
    Sym(char),
}

fn tokenize(text: &str) -> Result<Vec<Tok>, ExprError> {
    let chars: Vec<char> = text.chars().collect();
    let mut out = Vec::new();
    let mut i = 0;
    while i < chars.len() {
        let c = chars[i];
        if c.is_whitespace() {
            i += 1;
        } else if c.is_ascii_digit() || c == '.' {
            let start = i;
            while i < chars.len() && (chars[i].is_ascii_digit() || chars[i] == '.') {
                i += 1;
            }
            let s: String = chars[start..i].iter().collect();
            let v: f64 = s.parse().map_err(|_| ExprError(format!("bad number `{s}`")))?;
            out.push(Tok::Num(v, s));
        } else if c.is_alphabetic() || c == '_' {
            let start = i;
            while i < chars.len() && (chars[i].is_alphanumeric() || chars[i] == '_') {
                i += 1;
            }
            out.push(Tok::Ident(chars[start..i].iter().collect()));
        } else if "+-*/^(),".contains(c) {
            out.push(Tok::Sym(c));
            i += 1;
        } else {
            return Err(ExprError(format!("unexpected character `{c}` in `{text}`")));
        }
    }
    Ok(out)
}

struct Parser {
    tokens: Vec<Tok>,
    pos: usize,
}

impl Parser {
    fn peek(&self) -> Option<&Tok> {
        self.tokens.get(self.pos)
    }
    fn eat(&mut self, c: char) -> bool {
        if self.peek() == Some(&Tok::Sym(c)) {
            self.pos += 1;
            true
        } else {
            false
        }
    }
    fn sum(&mut self) -> Result<Expr, ExprError> {
        let mut lhs = self.product()?;
        loop {
            if self.eat('+') {
                lhs = Expr::Bin(Op::Add, Box::new(lhs), Box::new(self.product()?));
            } else if self.eat('-') {
                lhs = Expr::Bin(Op::Sub, Box::new(lhs), Box::new(self.product()?));
            } else {
                return Ok(lhs);
            }
        }
    }
    fn product(&mut self) -> Result<Expr, ExprError> {
        let mut lhs = self.unary()?;
        loop {
            if self.eat('*') {
                lhs = Expr::Bin(Op::Mul, Box::new(lhs), Box::new(self.unary()?));
            } else if self.eat('/') {
                lhs = Expr::Bin(Op::Div, Box::new(lhs), Box::new(self.unary()?));
            } else {
                return Ok(lhs);
            }
        }
    }
    fn unary(&mut self) -> Result<Expr, ExprError> {
        if self.eat('-') {
            return Ok(Expr::Neg(Box::new(self.unary()?)));
        }
        self.power()
    }
    fn power(&mut self) -> Result<Expr, ExprError> {
        let base = self.atom()?;
        if self.eat('^') {
            // Exponents are literal numbers so that dimensions stay checkable.
            match self.tokens.get(self.pos).cloned() {
                Some(Tok::Num(v, s)) => {
                    self.pos += 1;
                    return Ok(Expr::Bin(Op::Pow, Box::new(base), Box::new(Expr::Num(v, s))));
                }
                other => return Err(ExprError(format!("exponent must be a literal number, found {other:?}"))),
            }
        }
        Ok(base)
    }
    fn atom(&mut self) -> Result<Expr, ExprError> {
        match self.tokens.get(self.pos).cloned() {
            Some(Tok::Num(v, s)) => {
                self.pos += 1;
                Ok(Expr::Num(v, s))
            }
            Some(Tok::Ident(name)) => {
                self.pos += 1;
                if let Some(func) = Func::from_name(&name) {
                    if !self.eat('(') {
                        return Err(ExprError(format!("`{name}` needs parentheses")));
                    }
                    let mut args = vec![self.sum()?];
                    while self.eat(',') {
                        args.push(self.sum()?);
                    }
                    if !self.eat(')') {
                        return Err(ExprError(format!("missing `)` after arguments of `{name}`")));
                    }
                    if args.len() != func.arity() {
                        return Err(ExprError(format!("`{name}` takes {} argument(s)", func.arity())));
                    }
                    Ok(Expr::Call(func, args))
                } else {
                    Ok(Expr::Var(name))
                }
            }
            Some(Tok::Sym('(')) => {
                self.pos += 1;
                let e = self.sum()?;
                if !self.eat(')') {
                    return Err(ExprError("missing `)`".into()));
                }
                Ok(e)
            }
            other => Err(ExprError(format!("expected a number, symbol or `(`, found {other:?}"))),
        }
    }
}

/// A value with its dimension during evaluation.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DimValue {
    /// Value in SI base units.
    pub value: f64,
    /// Its dimension.
    pub dim: Dim,
}

/// The symbols a formula may use, with their values.
pub type Env = BTreeMap<String, Quantity>;

impl Expr {
    /// Evaluates the expression, checking dimensions at every operation.
    pub fn eval(&self, env: &Env) -> Result<DimValue, ExprError> {
        Ok(match self {
            Expr::Num(v, _) => DimValue { value: *v, dim: Dim::NONE },
            Expr::Var(name) => {
                let q = env.get(name).ok_or_else(|| ExprError(format!("symbol `{name}` has no value")))?;
                DimValue { value: q.value, dim: q.kind.dim() }
            }
            Expr::Neg(e) => {
                let v = e.eval(env)?;
                DimValue { value: -v.value, dim: v.dim }
            }
            Expr::Bin(op, a, b) => {
                let x = a.eval(env)?;
                let y = b.eval(env)?;
                match op {
                    Op::Add | Op::Sub => {
                        if x.dim != y.dim {
                            return Err(ExprError(format!("adding unlike dimensions in `{}`", self.symbolic())));
                        }
                        let value = if *op == Op::Add { x.value + y.value } else { x.value - y.value };
                        DimValue { value, dim: x.dim }
                    }
                    Op::Mul => DimValue { value: x.value * y.value, dim: x.dim.mul(y.dim) },
                    Op::Div => DimValue { value: x.value / y.value, dim: x.dim.div(y.dim) },
                    Op::Pow => {
                        let n = y.value;
                        let dim = if x.dim == Dim::NONE {
                            Dim::NONE
                        } else if n.fract() == 0.0 && n.abs() < 10.0 {
                            x.dim.powi(n as i8)
                        } else {
                            return Err(ExprError(format!(
                                "non-integer power of a dimensioned value in `{}`",
                                self.symbolic()
                            )));
                        };
                        DimValue { value: x.value.powf(n), dim }
                    }
                }
            }
            Expr::Call(f, args) => {
                let x = args[0].eval(env)?;
                let angle_arg = |x: DimValue| {
                    if x.dim == Dim::NONE {
                        Ok(x.value)
                    } else {
                        Err(ExprError(format!("{} of a dimensioned value", f.name())))
                    }
                };
                match f {
                    Func::Sqrt | Func::Cbrt => {
                        let n = if *f == Func::Sqrt { 2 } else { 3 };
                        let dim = x
                            .dim
                            .root(n)
                            .ok_or_else(|| ExprError(format!("root of `{}` has no dimension", self.symbolic())))?;
                        let value = if n == 2 { x.value.sqrt() } else { x.value.cbrt() };
                        DimValue { value, dim }
                    }
                    Func::Cos => DimValue { value: angle_arg(x)?.cos(), dim: Dim::NONE },
                    Func::Sin => DimValue { value: angle_arg(x)?.sin(), dim: Dim::NONE },
                    Func::Tan => DimValue { value: angle_arg(x)?.tan(), dim: Dim::NONE },
                    Func::Atan => DimValue { value: angle_arg(x)?.atan(), dim: Dim::NONE },
                    Func::Min | Func::Max => {
                        let y = args[1].eval(env)?;
                        if x.dim != y.dim {
                            return Err(ExprError(format!("comparing unlike dimensions in `{}`", self.symbolic())));
                        }
                        let value = if *f == Func::Min { x.value.min(y.value) } else { x.value.max(y.value) };
                        DimValue { value, dim: x.dim }
                    }
                }
            }
        })
    }

    /// The symbols this expression uses, in first-use order, without repeats.
    pub fn symbols(&self) -> Vec<String> {
        let mut out = Vec::new();
        self.collect_symbols(&mut out);
        out
    }

    fn collect_symbols(&self, out: &mut Vec<String>) {
        match self {
            Expr::Num(..) => {}
            Expr::Var(n) => {
                if !out.contains(n) {
                    out.push(n.clone())
                }
            }
            Expr::Neg(e) => e.collect_symbols(out),
            Expr::Bin(_, a, b) => {
                a.collect_symbols(out);
                b.collect_symbols(out);
            }
            Expr::Call(_, args) => args.iter().for_each(|a| a.collect_symbols(out)),
        }
    }

    /// The symbolic form for the report, e.g. `P·R/(S·E − 0.6·P)`.
    pub fn symbolic(&self) -> String {
        self.render(&|name| display_symbol(name), false)
    }

    /// The form with every symbol replaced by its value and unit in the
    /// report's unit system.
    pub fn substituted(&self, env: &Env, units: UnitSystem) -> String {
        self.render(
            &|name| match env.get(name) {
                Some(q) => units.display(*q),
                None => display_symbol(name),
            },
            true,
        )
    }

    /// `spaced` writes products as ` · ` so that values with units stay legible.
    fn render(&self, leaf: &dyn Fn(&str) -> String, spaced: bool) -> String {
        self.render_prec(leaf, 0, spaced)
    }

    /// Renders with the fewest parentheses that keep the meaning. `ctx` is the
    /// binding strength of the surrounding operator (0 none, 1 sum, 2 product,
    /// 3 right side of `−` or `/`, 4 power base).
    fn render_prec(&self, leaf: &dyn Fn(&str) -> String, ctx: u8, spaced: bool) -> String {
        match self {
            Expr::Num(_, s) => s.clone(),
            Expr::Var(n) => {
                let s = leaf(n);
                // A substituted value with a unit reads as one term.
                if ctx >= 2 && s.contains(' ') && ctx != 2 {
                    format!("({s})")
                } else {
                    s
                }
            }
            Expr::Neg(e) => format!("−{}", e.render_prec(leaf, 4, spaced)),
            Expr::Bin(op, a, b) => {
                let (prec, sym) = match op {
                    Op::Add => (1, " + "),
                    Op::Sub => (1, " − "),
                    Op::Mul => (2, "·"),
                    Op::Div => (2, "/"),
                    Op::Pow => (4, "^"),
                };
                if *op == Op::Pow {
                    let base = a.render_prec(leaf, 4, spaced);
                    let exp = match b.as_ref() {
                        Expr::Num(_, s) if s == "2" => "²".to_string(),
                        Expr::Num(_, s) if s == "3" => "³".to_string(),
                        other => format!("^{}", other.render_prec(leaf, 4, spaced)),
                    };
                    let needs = !matches!(a.as_ref(), Expr::Var(_) | Expr::Num(..) | Expr::Call(..));
                    let base = if needs && !base.starts_with('(') { format!("({base})") } else { base };
                    let s = format!("{base}{exp}");
                    return if ctx > 4 { format!("({s})") } else { s };
                }
                let left = a.render_prec(leaf, prec, spaced);
                let right_ctx = if matches!(op, Op::Sub | Op::Div) { prec + 1 } else { prec };
                let right = b.render_prec(leaf, right_ctx, spaced);
                let sym = if *op == Op::Mul && spaced { " · " } else { sym };
                let s = format!("{left}{sym}{right}");
                if prec < ctx {
                    format!("({s})")
                } else {
                    s
                }
            }
            Expr::Call(f, args) => {
                let inner: Vec<String> = args.iter().map(|a| a.render_prec(leaf, 0, spaced)).collect();
                format!("{}({})", f.name(), inner.join(", "))
            }
        }
    }
}

/// How a symbol name is shown: Greek names become letters, an underscore
/// starts a subscript written after the letter (`R_o` → `Ro`).
pub fn display_symbol(name: &str) -> String {
    let (head, sub) = match name.split_once('_') {
        Some((h, s)) => (h, s),
        None => (name, ""),
    };
    let head = match head {
        "alpha" => "α",
        "rho" => "ρ",
        "sigma" => "σ",
        "pi" => "π",
        "Delta" => "Δ",
        other => other,
    };
    format!("{head}{sub}")
}

/// Formats a dimensionless number the way literals are shown.
pub fn show_number(v: f64) -> String {
    format_number(v, 6)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::units::Kind;

    fn env(pairs: &[(&str, Quantity)]) -> Env {
        pairs.iter().map(|(k, v)| (k.to_string(), *v)).collect()
    }

    #[test]
    fn evaluates_and_renders_the_shell_formula() {
        let e = parse("P*R/(S*E - 0.6*P)").unwrap();
        assert_eq!(e.symbolic(), "P·R/(S·E − 0.6·P)");
        let en = env(&[
            ("P", Quantity::mpa(1.0)),
            ("R", Quantity::mm(903.0)),
            ("S", Quantity::new(138e6, Kind::Stress)),
            ("E", Quantity::new(0.85, Kind::Dimensionless)),
        ]);
        let v = e.eval(&en).unwrap();
        assert_eq!(v.dim, Dim::LENGTH);
        // Hand arithmetic: 1·903/(138·0.85 − 0.6) = 903/116.7 = 7.7378 mm.
        assert!((v.value * 1e3 - 903.0 / 116.7).abs() < 1e-9);
        assert_eq!(e.substituted(&en, UnitSystem::Si), "1 MPa · 903 mm/(138 MPa · 0.85 − 0.6 · 1 MPa)");
    }

    #[test]
    fn catches_dimension_errors() {
        let en = env(&[("P", Quantity::mpa(1.0)), ("R", Quantity::mm(1.0))]);
        assert!(parse("P + R").unwrap().eval(&en).is_err());
        assert!(parse("sqrt(P)").unwrap().eval(&en).is_err());
        assert!(parse("cos(R)").unwrap().eval(&en).is_err());
        assert!(parse("R^0.5").unwrap().eval(&en).is_err());
        assert_eq!(parse("sqrt(R*R)").unwrap().eval(&en).unwrap().dim, Dim::LENGTH);
        assert!(parse("Q").unwrap().eval(&en).is_err());
    }

    #[test]
    fn renders_powers_roots_and_greek() {
        assert_eq!(parse("(2 + a^2)/6").unwrap().symbolic(), "(2 + a²)/6");
        assert_eq!(parse("(3 + sqrt(L/r))/4").unwrap().symbolic(), "(3 + √(L/r))/4");
        assert_eq!(parse("P*D/(2*cos(alpha)*(S*E - 0.6*P))").unwrap().symbolic(), "P·D/(2·cos(α)·(S·E − 0.6·P))");
        assert_eq!(parse("R_o*(Z^0.5 - 1)").unwrap().symbolic(), "Ro·(Z^0.5 − 1)");
        assert_eq!(parse("a - (b - c)").unwrap().symbolic(), "a − (b − c)");
        assert_eq!(parse("a - b + c").unwrap().symbolic(), "a − b + c");
    }

    #[test]
    fn parse_errors_are_reported() {
        assert!(parse("P*").is_err());
        assert!(parse("sqrt P").is_err());
        assert!(parse("min(a)").is_err());
        assert!(parse("a $ b").is_err());
        assert!(parse("a^b").is_err());
    }
}
