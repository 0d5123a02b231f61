//! `cargo xtask serve [--port N]`: install what is missing, build, and serve on 127.0.0.1.

use crate::shell;
use crate::tools;

/// Default port of the development server.
const DEFAULT_PORT: u16 = 8080;

pub fn run(args: &[String]) -> Result<(), String> {
    let port = parse_port(args)?;
    tools::ensure_build_tools()?;
    println!("bandgauge: serving on http://127.0.0.1:{port}/ (Ctrl-C stops)");
    shell::run(tools::trunk().args([
        "serve",
        "--address",
        "127.0.0.1",
        "--port",
        &port.to_string(),
    ]))
}

fn parse_port(args: &[String]) -> Result<u16, String> {
    match args {
        [] => Ok(DEFAULT_PORT),
        [flag, value] if flag == "--port" => {
            value.parse::<u16>().ok().filter(|p| *p > 0).ok_or_else(|| {
                format!("--port: '{value}' is not a port; give a whole number from 1 to 65535")
            })
        }
        _ => Err(format!(
            "serve takes only [--port N], got: {}",
            args.join(" ")
        )),
    }
}
