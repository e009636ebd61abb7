//! A walker over the spanned TOML tree that reports every problem as
//! `file:line: where: key: message` and refuses keys it does not know.
//!
//! serde's derive would report a typo inside a tagged table as a missing field at the
//! table header (see crates.md); walking the tree by hand lets each message name the
//! exact key and line.

use super::units::{parse_quantity, Quantity};
use crate::error::Error;
use std::collections::BTreeSet;
use std::ops::Range;
use toml::de::{DeTable, DeValue};
use toml::Spanned;

/// The source text and its name, for turning byte spans into line numbers.
pub struct Source<'s> {
    /// The file name as shown in messages.
    pub name: String,
    text: &'s str,
}

impl<'s> Source<'s> {
    /// Wraps a file's text.
    pub fn new(name: String, text: &'s str) -> Self {
        Source { name, text }
    }

    /// The 1-based line of a byte offset.
    pub fn line(&self, offset: usize) -> usize {
        let end = offset.min(self.text.len());
        self.text.as_bytes()[..end].iter().filter(|&&b| b == b'\n').count() + 1
    }

    /// An input error at a span: `file:line: where: message`.
    pub fn error(
        &self,
        span: &Range<usize>,
        place: &str,
        message: impl std::fmt::Display,
    ) -> Error {
        if place.is_empty() {
            Error::input(format!("{}:{}: {message}", self.name, self.line(span.start)))
        } else {
            Error::input(format!("{}:{}: {place}: {message}", self.name, self.line(span.start)))
        }
    }
}

/// One TOML value with its place, as handed out by [`Table`].
pub struct Field<'a, 'i> {
    /// The source for messages.
    pub src: &'a Source<'a>,
    /// `where: key`, as shown in messages.
    pub place: String,
    /// The value and its span.
    pub value: &'a Spanned<DeValue<'i>>,
}

impl<'a, 'i> Field<'a, 'i> {
    /// The 1-based line of the value.
    pub fn line(&self) -> usize {
        self.src.line(self.value.span().start)
    }

    /// An error at this value.
    pub fn error(&self, message: impl std::fmt::Display) -> Error {
        self.src.error(&self.value.span(), &self.place, message)
    }

    /// An error at this value whose message already names the key.
    pub fn bare_error(&self, message: impl std::fmt::Display) -> Error {
        self.src.error(&self.value.span(), "", message)
    }

    /// The value as a string.
    ///
    /// # Errors
    /// Any other TOML type.
    pub fn str(&self) -> Result<String, Error> {
        match self.value.get_ref() {
            DeValue::String(s) => Ok(s.to_string()),
            other => Err(self.error(format!("expected a string, found {}", other.type_str()))),
        }
    }

    /// The value as a number: a TOML integer or float, or a string in engineering
    /// notation with the unit of `quantity`.
    ///
    /// # Errors
    /// Another type, a malformed or non-finite number.
    pub fn number(&self, quantity: Quantity) -> Result<f64, Error> {
        match self.value.get_ref() {
            DeValue::Integer(i) => {
                let digits = i.as_str().replace('_', "");
                let parsed = match digits.get(..2) {
                    Some("0x") | Some("0o") | Some("0b") => {
                        i64::from_str_radix(&digits[2..], i.radix()).map(|v| v as f64)
                    }
                    _ => digits.parse::<i64>().map(|v| v as f64),
                };
                parsed.map_err(|_| self.error(format!("`{}` is not an integer", i.as_str())))
            }
            DeValue::Float(f) => {
                let v: f64 = f.as_str().replace('_', "").parse().unwrap_or(f64::NAN);
                if v.is_finite() {
                    Ok(v)
                } else {
                    Err(self.error(format!("`{}` is not a finite number", f.as_str())))
                }
            }
            DeValue::String(s) => parse_quantity(s, quantity).map_err(|m| self.error(m)),
            other => Err(self.error(format!("expected a number, found {}", other.type_str()))),
        }
    }

    /// The value as a whole number in `lo..=hi`.
    ///
    /// # Errors
    /// Not a number, not whole, or out of range.
    pub fn whole(&self, lo: i64, hi: i64) -> Result<i64, Error> {
        let v = self.number(Quantity::Plain)?;
        if v.fract() != 0.0 || v < lo as f64 || v > hi as f64 {
            return Err(self.error(format!("{v} must be a whole number from {lo} to {hi}")));
        }
        Ok(v as i64)
    }

    /// The value as an array of fields.
    ///
    /// # Errors
    /// Any other TOML type.
    pub fn array(&self) -> Result<Vec<Field<'a, 'i>>, Error> {
        match self.value.get_ref() {
            DeValue::Array(items) => Ok(items
                .iter()
                .enumerate()
                .map(|(i, value)| Field {
                    src: self.src,
                    place: format!("{}[{}]", self.place, i),
                    value,
                })
                .collect()),
            other => Err(self.error(format!("expected an array, found {}", other.type_str()))),
        }
    }

    /// The value as a table whose keys are then read one by one.
    ///
    /// # Errors
    /// Any other TOML type.
    pub fn table(&self, place: String) -> Result<Table<'a, 'i>, Error> {
        match self.value.get_ref() {
            DeValue::Table(t) => Ok(Table::new(self.src, t, self.value.span(), place)),
            other => Err(self.error(format!("expected a table, found {}", other.type_str()))),
        }
    }

    /// True for a TOML table (inline or not).
    pub fn is_table(&self) -> bool {
        matches!(self.value.get_ref(), DeValue::Table(_))
    }
}

/// A TOML table whose keys are consumed one by one; [`Table::finish`] refuses the
/// keys nobody asked for.
pub struct Table<'a, 'i> {
    src: &'a Source<'a>,
    table: &'a DeTable<'i>,
    span: Range<usize>,
    /// Where this table is, as shown in messages (`stage 2`, `target`).
    pub place: String,
    used: BTreeSet<String>,
}

impl<'a, 'i> Table<'a, 'i> {
    /// Wraps a parsed table.
    pub fn new(
        src: &'a Source<'a>,
        table: &'a DeTable<'i>,
        span: Range<usize>,
        place: String,
    ) -> Self {
        Table { src, table, span, place, used: BTreeSet::new() }
    }

    /// The source for messages.
    pub fn src(&self) -> &'a Source<'a> {
        self.src
    }

    /// The 1-based line where the table starts.
    pub fn line(&self) -> usize {
        self.src.line(self.span.start)
    }

    /// An error at the table itself (for a missing key or a rule across keys).
    pub fn error(&self, message: impl std::fmt::Display) -> Error {
        self.src.error(&self.span, &self.place, message)
    }

    /// An error at the table whose message already names the key.
    pub fn bare_error(&self, message: impl std::fmt::Display) -> Error {
        self.src.error(&self.span, "", message)
    }

    /// The value of `key`, if present; marks it as known.
    pub fn get(&mut self, key: &str) -> Option<Field<'a, 'i>> {
        self.used.insert(key.to_string());
        let (_, value) = self.table.get_key_value(key)?;
        let place = if self.place.is_empty() {
            key.to_string()
        } else {
            format!("{}: {}", self.place, key)
        };
        Some(Field { src: self.src, place, value })
    }

    /// The value of `key`, which must be present.
    ///
    /// # Errors
    /// The key is missing.
    pub fn require(&mut self, key: &str) -> Result<Field<'a, 'i>, Error> {
        self.get(key).ok_or_else(|| self.error(format!("missing key `{key}`")))
    }

    /// True when the table has `key` (without marking it as known).
    pub fn has(&self, key: &str) -> bool {
        self.table.get(key).is_some()
    }

    /// All keys in file order, without marking them.
    pub fn keys(&self) -> Vec<String> {
        self.table.keys().map(|k| k.get_ref().to_string()).collect()
    }

    /// Refuses the first key that was never asked for, listing the known ones.
    ///
    /// # Errors
    /// An unknown key.
    pub fn finish(self) -> Result<(), Error> {
        for (key, value) in self.table.iter() {
            let name = key.get_ref();
            if !self.used.contains(name.as_ref()) {
                let known: Vec<&str> = self.used.iter().map(String::as_str).collect();
                let span = if key.span().is_empty() { value.span() } else { key.span() };
                return Err(self.src.error(
                    &span,
                    &self.place,
                    format!("unknown key `{name}` (expected one of: {})", known.join(", ")),
                ));
            }
        }
        Ok(())
    }
}
