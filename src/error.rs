//! The crate's one error type: an opaque value carrying a kind and a message
//! that is already fit to show a person (file, line and column included where
//! the input had them). The binary maps kinds to exit codes in one place.

use std::fmt;

/// What went wrong, coarsely. The binary maps kinds to exit codes in one
/// function (`exit_code` in src/cli/mod.rs): `Closed` is 0, every other kind 2.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
#[non_exhaustive]
pub enum ErrorKind {
    /// Text that does not follow the grammar (expressions, angles).
    Parse,
    /// Well-formed input that the tool cannot use (unknown name, wrong field,
    /// an angle whose cos^2 is irrational, ...).
    Input,
    /// A number outside the range the tool supports (loop order, digits, coupling).
    Range,
    /// Reading or writing a file failed.
    Io,
    /// A numerical computation could not reach the requested accuracy.
    Numeric,
    /// Whoever read the output stopped reading (a closed pipe, as under
    /// `| head`): the end of a run, not a failure.
    Closed,
}

/// An error with a message meant for the person at the terminal.
#[derive(Debug, Clone, PartialEq, Eq)]
pub struct Error {
    kind: ErrorKind,
    message: String,
}

impl Error {
    pub fn new(kind: ErrorKind, message: impl Into<String>) -> Self {
        Error {
            kind,
            message: message.into(),
        }
    }
    pub fn input(message: impl Into<String>) -> Self {
        Self::new(ErrorKind::Input, message)
    }
    pub fn range(message: impl Into<String>) -> Self {
        Self::new(ErrorKind::Range, message)
    }
    pub fn io(message: impl Into<String>) -> Self {
        Self::new(ErrorKind::Io, message)
    }
    pub fn numeric(message: impl Into<String>) -> Self {
        Self::new(ErrorKind::Numeric, message)
    }
    pub fn closed(message: impl Into<String>) -> Self {
        Self::new(ErrorKind::Closed, message)
    }
    pub fn kind(&self) -> ErrorKind {
        self.kind
    }
    pub fn message(&self) -> &str {
        &self.message
    }
    /// Prefixes the message with where it happened (a file name, an entry).
    pub fn context(self, place: impl fmt::Display) -> Self {
        Error {
            kind: self.kind,
            message: format!("{place}: {}", self.message),
        }
    }
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.message)
    }
}

impl std::error::Error for Error {}

pub type Result<T> = std::result::Result<T, Error>;
