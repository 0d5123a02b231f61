//! The command line as a whole: --help, --version and clap's usage errors (exit code 2).

mod support;

use support::{EXIT_BAD_INPUT, bandgauge, success};

#[test]
fn help_lists_the_subcommands_and_the_caution() {
    let text = success(&["--help"]);
    for command in ["carriers", "materials", "convert", "probe"] {
        assert!(
            text.lines().any(|l| l.trim_start().starts_with(command)),
            "{command}"
        );
    }
    assert!(text.contains("Values are model estimates; the fab's own specifications and the governing standards decide acceptance."));
}

#[test]
fn each_subcommand_documents_its_options() {
    let cases: [(&str, &[&str]); 4] = [
        (
            "carriers",
            &[
                "--material",
                "--temperature",
                "--donor",
                "--acceptor",
                "--json",
                "--sweep",
            ],
        ),
        ("materials", &["--json"]),
        (
            "convert",
            &[
                "--material",
                "--dopant",
                "--resistivity",
                "--density",
                "--temperature",
                "--model",
                "--json",
            ],
        ),
        (
            "probe",
            &[
                "--volts",
                "--amps",
                "--spacing",
                "--thickness",
                "--diameter",
                "--temperature-c",
                "--json",
            ],
        ),
    ];
    for (command, options) in cases {
        let text = success(&[command, "--help"]);
        for option in options {
            let documented = text.match_indices(option).any(|(at, _)| {
                // The whole option, not a longer one that starts with it.
                !text[at + option.len()..]
                    .starts_with(|c: char| c == '-' || c.is_ascii_alphanumeric())
            });
            assert!(documented, "{command} --help lacks {option}");
        }
    }
}

#[test]
fn version_is_the_package_version() {
    assert_eq!(
        success(&["--version"]),
        format!("bandgauge {}\n", env!("CARGO_PKG_VERSION"))
    );
}

#[test]
fn usage_errors_exit_with_code_2() {
    for args in [
        &[][..],
        &["frobnicate"],
        &["carriers", "--no-such-option"],
        &["carriers", "--temperature"],
        &["probe", "--volts", "0.01"],
    ] {
        let run = bandgauge(args);
        assert_eq!(run.code, EXIT_BAD_INPUT, "{args:?}: {}", run.stderr);
        assert!(run.stdout.is_empty(), "{args:?}");
        assert!(
            run.stderr.starts_with("error: ") || run.stderr.contains("Usage: bandgauge"),
            "{args:?}: {}",
            run.stderr
        );
    }
}
