//! `caloris init TEMPLATE [FILE]`: start a model from a template (a wall build-up, a lagged
//! pipe, an electronic part), written in canonical layout and solved by the test suite.

use crate::{console, exit, usage};
use std::path::PathBuf;

/// The templates `caloris init` offers.
#[derive(Clone, Copy, Debug, clap::ValueEnum)]
pub enum Template {
    /// A wall build-up: U-value against a target and the inner surface temperature.
    Wall,
    /// A lagged pipe: heat loss over its run and the touch temperature of its surface.
    Pipe,
    /// An electronic part: junction to ambient against the junction's rating.
    Part,
}

impl Template {
    pub fn text(self) -> &'static str {
        match self {
            Template::Wall => include_str!("templates/wall.heat"),
            Template::Pipe => include_str!("templates/pipe.heat"),
            Template::Part => include_str!("templates/part.heat"),
        }
    }
    fn file_name(self) -> &'static str {
        match self {
            Template::Wall => "wall.heat",
            Template::Pipe => "pipe.heat",
            Template::Part => "part.heat",
        }
    }
}

pub fn run(template: Template, file: Option<PathBuf>) -> u8 {
    let path = file.unwrap_or_else(|| PathBuf::from(template.file_name()));
    if path.as_os_str() == "-" {
        print!("{}", template.text());
        return exit::OK;
    }
    // Never replace an analyst's file: `create_new` fails if anything is there.
    let written = std::fs::OpenOptions::new()
        .write(true)
        .create_new(true)
        .open(&path)
        .and_then(|mut f| std::io::Write::write_all(&mut f, template.text().as_bytes()));
    match written {
        Ok(()) => {
            console::status(format!(
                "wrote {}; solve it with `caloris solve {}`",
                path.display(),
                path.display()
            ));
            exit::OK
        }
        Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists => usage(format!(
            "`{}` already exists; name another file: `caloris init {} NEW.heat`",
            path.display(),
            template.file_name().trim_end_matches(".heat")
        )),
        Err(e) => usage(format!("cannot write `{}`: {e}", path.display())),
    }
}
