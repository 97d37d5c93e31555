//! One error type for the whole crate. The kind says who can fix the problem, which
//! the command line turns into an exit status: `Input` (exit 2, the user can), and
//! `Environment` and `Internal` (exit 1: the machine or the file system refused, with
//! the operating system's reason kept as the source; or a fault of lobecast itself).
//! Context added on the way up keeps the kind, the hint and the source.

use std::fmt;
use std::sync::Arc;

/// Who can fix the problem.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Kind {
    /// Bad input or usage: a file, a flag, a value the user can change.
    Input,
    /// The environment refused: a read or write failed, a disk is full, a pipe closed.
    Environment,
    /// A fault in lobecast (a broken invariant): worth a bug report.
    Internal,
    /// An iterative method ran out of iterations: the input was valid, the answer
    /// was not found; the message carries the last figures.
    Unconverged,
}

impl Kind {
    /// The exit status the command line uses for this kind.
    pub fn exit_status(self) -> i32 {
        match self {
            Kind::Input => 2,
            Kind::Environment | Kind::Internal | Kind::Unconverged => 1,
        }
    }
}

#[derive(Debug, Clone)]
pub struct Error {
    pub kind: Kind,
    pub message: String,
    pub hint: Option<String>,
    /// The underlying error (an I/O error with the operating system's reason).
    pub source: Option<Arc<dyn std::error::Error + Send + Sync>>,
}

pub type Result<T> = std::result::Result<T, Error>;

impl Error {
    fn new(kind: Kind, message: impl Into<String>) -> Self {
        Error {
            kind,
            message: message.into(),
            hint: None,
            source: None,
        }
    }

    pub fn input(message: impl Into<String>) -> Self {
        Self::new(Kind::Input, message)
    }

    pub fn environment(message: impl Into<String>) -> Self {
        Self::new(Kind::Environment, message)
    }

    pub fn unconverged(message: impl Into<String>) -> Self {
        Error::new(Kind::Unconverged, message)
    }

    pub fn internal(message: impl Into<String>) -> Self {
        Self::new(Kind::Internal, message)
    }

    /// An I/O failure while doing `what` ("writing x.cube"): the environment's
    /// fault, with the operating system's reason in the message and as the source.
    pub fn io(what: impl fmt::Display, e: std::io::Error) -> Self {
        let mut err = Self::environment(format!("{what} failed: {e}"));
        err.source = Some(Arc::new(e));
        err
    }

    /// A failure to read an input: a missing file, a folder or bytes that are not
    /// what they claim is the user's to fix (`Input`); anything else (a device
    /// error, a permission the machine withholds) is the environment's.
    pub fn reading(what: impl fmt::Display, e: std::io::Error) -> Self {
        Self::read_failure(format!("cannot read {what}: {e}"), e)
    }

    /// `reading` with a message of the caller's own layout.
    pub fn read_failure(message: impl Into<String>, e: std::io::Error) -> Self {
        use std::io::ErrorKind as K;
        let user = matches!(
            e.kind(),
            K::NotFound | K::InvalidData | K::UnexpectedEof | K::IsADirectory | K::InvalidInput
        );
        let mut err = Self::new(if user { Kind::Input } else { Kind::Environment }, message);
        err.source = Some(Arc::new(e));
        err
    }

    pub fn with_hint(mut self, hint: impl Into<String>) -> Self {
        self.hint = Some(hint.into());
        self
    }

    /// Prefixes the message ("water.xyz: …"), keeping kind, hint and source.
    pub fn context(mut self, prefix: impl fmt::Display) -> Self {
        self.message = format!("{prefix}: {}", self.message);
        self
    }
}

impl fmt::Display for Error {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(&self.message)
    }
}

impl std::error::Error for Error {
    fn source(&self) -> Option<&(dyn std::error::Error + 'static)> {
        self.source
            .as_deref()
            .map(|e| e as &(dyn std::error::Error + 'static))
    }
}

/// Shorthand for `Err(Error::input(format!(...)))`.
#[macro_export]
macro_rules! bail_input {
    ($($arg:tt)*) => {
        return Err($crate::error::Error::input(format!($($arg)*)))
    };
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn context_keeps_kind_hint_and_source() {
        let e = Error::io(
            "writing x.cube",
            std::io::Error::new(std::io::ErrorKind::StorageFull, "no space left"),
        )
        .with_hint("free some space")
        .context("volume");
        assert_eq!(e.kind, Kind::Environment);
        assert_eq!(e.hint.as_deref(), Some("free some space"));
        assert!(
            e.message
                .starts_with("volume: writing x.cube failed: no space left")
        );
        let src = std::error::Error::source(&e).expect("the I/O error is kept");
        assert_eq!(src.to_string(), "no space left");
        assert_eq!(e.kind.exit_status(), 1);
        assert_eq!(Error::input("bad").context("m.toml").kind.exit_status(), 2);
    }
}
