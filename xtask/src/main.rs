//! `cargo xtask`: set-up, build, serve, test and benchmark automation for bandgauge.
//!
//! One module per subcommand; `tools` installs missing prerequisites idempotently.

mod bench;
mod dist;
mod fuzz;
mod serve;
mod shell;
mod size;
mod test;
mod tools;

use std::process::ExitCode;

const USAGE: &str = "\
usage: cargo xtask <command> [options]

commands:
  serve [--port N] [--release]
                     install missing tools, build the app and serve it on http://127.0.0.1:N
                     (default 8080); an edit rebuilds it (a development build unless --release)
  dist [--out DIR]   release build of the app into dist/ (or DIR), with the self-contained
                     dist/bandgauge-standalone.html
  test               every check: fmt, clippy (native and wasm32), unit and reference tests,
                     the wasm release build and the browser tests; ends with 'N passed, N failed'
  bench              criterion benchmarks of the core and in-browser timings, as one table
  size [--top N]     where the release wasm's bytes go: each part of the program (our views by
                     module, the physics core, Leptos, the standard library, other crates, data)
                     raw and gzipped, and the N largest functions (default 20)
  fuzz [--seconds N] [TARGET...]
                     run the cargo-fuzz targets (all, or those named) for N s each (default 60),
                     as one table; fails on any crashing input and names its file
";

fn main() -> ExitCode {
    let args: Vec<String> = std::env::args().skip(1).collect();
    let Some((command, rest)) = args.split_first() else {
        eprint!("{USAGE}");
        return ExitCode::from(2);
    };
    let result = match command.as_str() {
        "serve" => serve::run(rest),
        "dist" => dist::run(rest).map(|_| ()),
        "test" => test::run(rest),
        "bench" => bench::run(rest),
        "fuzz" => fuzz::run(rest),
        "size" => size::run(rest),
        "help" | "--help" | "-h" => {
            print!("{USAGE}");
            Ok(())
        }
        other => Err(format!("unknown command '{other}'\n{USAGE}")),
    };
    match result {
        Ok(()) => ExitCode::SUCCESS,
        Err(message) => {
            eprintln!("xtask: {message}");
            ExitCode::FAILURE
        }
    }
}
