//! The `bandgauge` binary: thin glue from validated arguments to `bandgauge-core`.
//!
//! Exit codes: 0 success; 2 input refused (by clap's usage check, by the
//! validation in `request`, or by a model of the core); 1 any other failure.

mod args;
mod carriers;
mod convert;
mod error;
mod hall;
mod lots;
mod materials_cmd;
mod output;
mod probe;
mod request;

use std::io::{self, Write};
use std::process::ExitCode;

use clap::Parser;

use crate::args::{Cli, Command};
use crate::carriers::CarriersRequest;
use crate::convert::ConvertRequest;
use crate::error::{CliError, EXIT_BAD_INPUT, EXIT_FAILURE};
use crate::hall::HallRequest;
use crate::probe::ProbeRequest;

fn main() -> ExitCode {
    // clap prints its own usage errors and exits with code 2, help and version with 0.
    let cli = Cli::parse();
    // `lots` has its own exit codes (3: some rows rejected), so it runs on its own.
    if let Command::Lots(args) = &cli.command {
        return lots::main(args);
    }
    let stdout = io::stdout();
    let mut out = io::BufWriter::new(stdout.lock());
    let result = run(&cli.command, &mut out).and_then(|()| out.flush().map_err(CliError::from));
    match result {
        Ok(()) => ExitCode::SUCCESS,
        Err(CliError::BadInput(error)) => {
            eprintln!("error: {error}");
            ExitCode::from(EXIT_BAD_INPUT)
        }
        Err(CliError::Failure(error)) => {
            // A closed pipe (`bandgauge ... | head`) is not worth a message.
            let broken_pipe = error
                .downcast_ref::<io::Error>()
                .is_some_and(|e| e.kind() == io::ErrorKind::BrokenPipe);
            if !broken_pipe {
                eprintln!("error: {error:#}");
            }
            ExitCode::from(EXIT_FAILURE)
        }
    }
}

/// Validates the arguments of one subcommand into its request type, then runs it.
fn run(command: &Command, out: &mut impl Write) -> Result<(), CliError> {
    match command {
        Command::Carriers(args) => carriers::run(&CarriersRequest::from_args(args)?, out),
        Command::Materials(args) => materials_cmd::run(args.json, out),
        Command::Convert(args) => convert::run(&ConvertRequest::from_args(args)?, out),
        Command::Probe(args) => probe::run(&ProbeRequest::from_args(args)?, out),
        Command::Hall(args) => hall::run(&HallRequest::from_args(args)?, out),
        Command::Lots(_) => unreachable!("`lots` is dispatched in main"),
    }
}
