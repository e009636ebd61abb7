//! Templates: the built-in ones embedded in the binary, user replacements, rendering.
//!
//! Each language has a fixed list of templates (file name → output file). A user
//! template given with `--template FILE` replaces the built-in template whose file name
//! equals FILE's (copy `firmware-templates/c/filter.c.j2`, edit it, pass it back).
//! Rendering is strict: an unknown variable or attribute is an error naming the
//! template and its line. Blocks trim their own line ends (`trim_blocks`,
//! `lstrip_blocks`) so templates can be indented like the code they make.

use super::context::Context;
use super::{Lang, OutputFile};
use crate::error::{Error, Result};
use minijinja::value::{Serde, Value};
use minijinja::{syntax::SyntaxConfig, Environment, UndefinedBehavior};
use std::path::PathBuf;

/// When a template is rendered.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
enum When {
    /// Every export.
    Always,
    /// Only with golden vectors.
    Vectors,
}

/// A built-in template: its file name, its text, when it applies, and the output name
/// (from the context's file names).
struct Builtin {
    name: &'static str,
    text: &'static str,
    when: When,
    output: fn(&Context) -> &str,
}

const C_TEMPLATES: [Builtin; 4] = [
    Builtin {
        name: "filter.h.j2",
        text: include_str!("../../firmware-templates/c/filter.h.j2"),
        when: When::Always,
        output: |c| &c.files.header,
    },
    Builtin {
        name: "filter.c.j2",
        text: include_str!("../../firmware-templates/c/filter.c.j2"),
        when: When::Always,
        output: |c| &c.files.kernel,
    },
    Builtin {
        name: "vectors.h.j2",
        text: include_str!("../../firmware-templates/c/vectors.h.j2"),
        when: When::Vectors,
        output: |c| &c.files.vectors,
    },
    Builtin {
        name: "check.c.j2",
        text: include_str!("../../firmware-templates/c/check.c.j2"),
        when: When::Vectors,
        output: |c| &c.files.check,
    },
];

const RUST_TEMPLATES: [Builtin; 3] = [
    Builtin {
        name: "filter.rs.j2",
        text: include_str!("../../firmware-templates/rust/filter.rs.j2"),
        when: When::Always,
        output: |c| &c.files.module,
    },
    Builtin {
        name: "vectors.rs.j2",
        text: include_str!("../../firmware-templates/rust/vectors.rs.j2"),
        when: When::Vectors,
        output: |c| &c.files.vectors,
    },
    Builtin {
        name: "check.rs.j2",
        text: include_str!("../../firmware-templates/rust/check.rs.j2"),
        when: When::Vectors,
        output: |c| &c.files.check,
    },
];

fn builtins(lang: Lang) -> &'static [Builtin] {
    match lang {
        Lang::C => &C_TEMPLATES,
        Lang::Rust => &RUST_TEMPLATES,
    }
}

/// File names of the built-in templates of `lang`.
pub fn builtin_names(lang: Lang) -> Vec<&'static str> {
    builtins(lang).iter().map(|b| b.name).collect()
}

/// The text of a built-in template, by file name.
pub fn builtin_text(lang: Lang, name: &str) -> Option<&'static str> {
    builtins(lang).iter().find(|b| b.name == name).map(|b| b.text)
}

/// A template to render: the name shown in messages and its text.
struct Source {
    shown: String,
    text: String,
}

/// The templates to use: built-in ones, replaced by user files of the same name.
fn sources(lang: Lang, user: &[PathBuf]) -> Result<Vec<Source>> {
    let mut out: Vec<Source> = builtins(lang)
        .iter()
        .map(|b| Source { shown: b.name.to_string(), text: b.text.to_string() })
        .collect();
    for path in user {
        let name = path.file_name().map(|n| n.to_string_lossy().into_owned()).unwrap_or_default();
        let slot = builtins(lang).iter().position(|b| b.name == name).ok_or_else(|| {
            Error::input(format!(
                "--template {}: `{name}` is not a built-in template name for this language \
                 (one of {})",
                path.display(),
                builtin_names(lang).join(", ")
            ))
        })?;
        let text = std::fs::read_to_string(path).map_err(|e| Error::io(path, e))?;
        out[slot] = Source { shown: path.display().to_string(), text };
    }
    Ok(out)
}

/// A minijinja error as one line: `template:line: what`.
fn template_error(shown: &str, e: &minijinja::Error) -> Error {
    let line = e.line().map_or(String::new(), |l| format!(":{l}"));
    let what = match e.detail() {
        Some(d) => format!("{}: {d}", e.kind()),
        None => e.kind().to_string(),
    };
    Error::input(format!("{shown}{line}: template error: {what}"))
}

/// Renders every template that applies, in the built-in order.
///
/// # Errors
/// A user template that is unreadable or named like no built-in template; a syntax
/// error or an unknown variable in any template, naming the template and line.
pub fn render_all(lang: Lang, user: &[PathBuf], context: &Context) -> Result<Vec<OutputFile>> {
    let sources = sources(lang, user)?;
    let mut env = Environment::new();
    env.set_undefined_behavior(UndefinedBehavior::Strict);
    let syntax = SyntaxConfig::builder()
        .trim_blocks(true)
        .lstrip_blocks(true)
        .keep_trailing_newline(true)
        .build()
        .map_err(|e| Error::Internal(e.to_string()))?;
    env.set_syntax(syntax);
    let value = Value::from(Serde(context));
    let mut files = Vec::new();
    for (b, src) in builtins(lang).iter().zip(&sources) {
        // A user template is checked even when its output is not wanted this time.
        let tmpl = env
            .template_from_named_str(&src.shown, &src.text)
            .map_err(|e| template_error(&src.shown, &e))?;
        if b.when == When::Vectors && context.vectors.is_none() {
            continue;
        }
        let text = tmpl.render(&value).map_err(|e| template_error(&src.shown, &e))?;
        files.push(OutputFile { name: (b.output)(context).to_string(), text });
    }
    Ok(files)
}
