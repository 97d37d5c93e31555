//! One error type for the whole crate. The CLI maps `Kind::Input` to exit status 2
//! (the user can fix it) and everything else to 1.

use std::fmt;

/// Who can fix the problem: the user (bad input or usage) or nobody short of a bug
/// report or a better machine (I/O failures that are not the user's doing).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    Input,
    Internal,
}

#[derive(Debug, Clone)]
pub struct Error {
    pub kind: Kind,
    pub message: String,
    pub hint: Option<String>,
}

pub type Result<T> = std::result::Result<T, Error>;

impl Error {
    pub fn input(message: impl Into<String>) -> Self {
        Error {
            kind: Kind::Input,
            message: message.into(),
            hint: None,
        }
    }

    pub fn internal(message: impl Into<String>) -> Self {
        Error {
            kind: Kind::Internal,
            message: message.into(),
            hint: None,
        }
    }

    pub fn with_hint(mut self, hint: impl Into<String>) -> Self {
        self.hint = Some(hint.into());
        self
    }
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.message)
    }
}

impl std::error::Error for Error {}

/// Shorthand for `Err(Error::input(format!(...)))`.
#[macro_export]
macro_rules! bail_input {
    ($($arg:tt)*) => {
        return Err($crate::error::Error::input(format!($($arg)*)))
    };
}
