//! Generated lot files for the large-file browser test and the benchmarks: invented values (demo
//! data, no measurement) in the columns of `demo-wafers/README.md`, one row per site.
//!
//! Plain `std` only: `xtask` includes this file with `#[path]` to write its 10,000,000-row file
//! row by row, while the tests build theirs in memory.

use std::io::{self, Write};

/// The header line of every generated file.
pub const HEADER: &str = "lot,wafer,site,x [mm],y [mm],dopant,resistivity [ohm-cm]";

/// How a generated file is laid out: every lot has the same wafers, every wafer the same sites.
#[derive(Clone, Copy, Debug)]
pub struct LotRows {
    /// Lots in the file.
    pub lots: usize,
    /// Wafers per lot.
    pub wafers: usize,
    /// Sites per wafer.
    pub sites_per_wafer: usize,
    /// Dopant of every row, e.g. "P".
    pub dopant: &'static str,
    /// Lot ids are this text followed by the lot's number.
    pub lot_prefix: &'static str,
}

impl LotRows {
    /// Rows of the file (the header not counted).
    pub fn rows(&self) -> usize {
        self.lots * self.wafers * self.sites_per_wafer
    }

    /// Writes the header and every row to `out`.
    ///
    /// Invented values: lots 0.3 ohm cm apart, wafers 0.02 apart, sites spread over 0.5 from
    /// 9 ohm cm; sites on a 3 mm grid, 40 to a line, 25 lines, repeated past 1000 sites.
    pub fn write_to(&self, out: &mut impl Write) -> io::Result<()> {
        writeln!(out, "{HEADER}")?;
        for lot in 0..self.lots {
            for wafer in 0..self.wafers {
                for site in 0..self.sites_per_wafer {
                    let value = 9.0
                        + lot as f64 * 0.3
                        + wafer as f64 * 0.02
                        + ((site * 31) % 1000) as f64 / 2000.0;
                    let x = (site % 40) as f64 * 3.0 - 60.0;
                    let y = ((site / 40) % 25) as f64 * 3.0 - 36.0;
                    writeln!(
                        out,
                        "{}{lot},{wafer:02},{site},{x},{y},{},{value:.3}",
                        self.lot_prefix, self.dopant
                    )?;
                }
            }
        }
        Ok(())
    }

    /// The whole file as text.
    pub fn text(&self) -> String {
        let mut bytes = Vec::with_capacity(self.rows() * 40);
        self.write_to(&mut bytes)
            .expect("writing to memory cannot fail");
        String::from_utf8(bytes).expect("every generated field is ASCII")
    }
}
