//! The one error type of the library, grouped by origin.
//!
//! Every message is lowercase, has no trailing period, and names the constraint, the
//! actual value and the place (`tone.toml:12: stage 3: freq 30000 Hz must be below
//! rate/2 = 24000 Hz`). The CLI maps [`Error::exit_code`] to the process exit code.

use std::path::Path;

/// A failure of any stage of the pipeline.
#[derive(Debug, thiserror::Error)]
#[non_exhaustive]
pub enum Error {
    /// The user's input is malformed or asks for something impossible (exit 2).
    #[error("{0}")]
    Input(String),
    /// The numbers do not work out: singular circuit, no convergence, unstable (exit 2).
    #[error("{0}")]
    Numeric(String),
    /// A file could not be read or written (exit 2).
    #[error("{path}: {message}")]
    Io {
        /// The file concerned.
        path: String,
        /// What went wrong.
        message: String,
    },
    /// A requested check failed, such as a quantized design that does not fit (exit 1).
    #[error("{0}")]
    CheckFailed(String),
    /// A bug in tonewright (exit 1).
    #[error("internal error: {0}")]
    Internal(String),
}

impl Error {
    /// The process exit code for this error: 2 for bad input or I/O, 1 otherwise.
    pub fn exit_code(&self) -> i32 {
        match self {
            Error::Input(_) | Error::Numeric(_) | Error::Io { .. } => 2,
            Error::CheckFailed(_) | Error::Internal(_) => 1,
        }
    }

    /// An I/O error on `path`.
    pub fn io(path: &Path, err: impl std::fmt::Display) -> Self {
        Error::Io { path: path.display().to_string(), message: err.to_string() }
    }

    /// A user-input error.
    pub fn input(message: impl Into<String>) -> Self {
        Error::Input(message.into())
    }

    /// A numerical failure.
    pub fn numeric(message: impl Into<String>) -> Self {
        Error::Numeric(message.into())
    }
}

/// Shorthand for results of this crate.
pub type Result<T> = std::result::Result<T, Error>;
