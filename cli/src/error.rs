//! The two ways a command fails: bad input (exit code 2) or a failure to write the answer (exit code 1).

use std::fmt;

/// Exit code for input that was refused: the same code clap uses for usage errors.
pub const EXIT_BAD_INPUT: u8 = 2;
/// Exit code for any other failure (for example, stdout closed).
pub const EXIT_FAILURE: u8 = 1;

/// Input that bandgauge refuses, with the argument it came from.
#[derive(Debug, Clone, PartialEq)]
pub struct BadInput {
    /// The command-line argument, e.g. "--resistivity".
    pub argument: String,
    /// What was given and what is allowed.
    pub message: String,
}

impl BadInput {
    /// A refusal of `argument`.
    pub fn new(argument: &str, message: impl Into<String>) -> BadInput {
        BadInput {
            argument: argument.to_owned(),
            message: message.into(),
        }
    }

    /// The same refusal with `part` (e.g. "START") put before the message.
    pub fn prefixed(self, part: &str) -> BadInput {
        BadInput {
            message: format!("{part} {}", self.message),
            ..self
        }
    }
}

impl fmt::Display for BadInput {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        write!(f, "{}: {}", self.argument, self.message)
    }
}

impl std::error::Error for BadInput {}

/// Why a command stopped.
#[derive(Debug)]
pub enum CliError {
    /// The input was refused; exit code 2.
    BadInput(BadInput),
    /// Anything else, e.g. an I/O error on stdout; exit code 1.
    Failure(anyhow::Error),
}

impl From<BadInput> for CliError {
    fn from(error: BadInput) -> CliError {
        CliError::BadInput(error)
    }
}

impl From<anyhow::Error> for CliError {
    fn from(error: anyhow::Error) -> CliError {
        CliError::Failure(error)
    }
}

impl From<std::io::Error> for CliError {
    fn from(error: std::io::Error) -> CliError {
        CliError::Failure(anyhow::Error::new(error).context("writing the answer"))
    }
}

impl From<serde_json::Error> for CliError {
    fn from(error: serde_json::Error) -> CliError {
        CliError::Failure(anyhow::Error::new(error).context("writing JSON"))
    }
}
