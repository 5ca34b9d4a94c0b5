//! Reads imported model files for the compiler, relative to the importing file and never
//! outside the project root (the nearest folder above the model that holds `.git`, or the
//! model's own folder).

use caloris_compiler::source::SourceLoader;
use std::path::{Path, PathBuf};

pub struct FsLoader {
    root: PathBuf,
}

impl FsLoader {
    pub fn for_model(model: &Path) -> FsLoader {
        let dir = model
            .parent()
            .filter(|p| !p.as_os_str().is_empty())
            .map(Path::to_path_buf)
            .unwrap_or_else(|| PathBuf::from("."));
        let dir = dir.canonicalize().unwrap_or(dir);
        let root = dir
            .ancestors()
            .find(|a| a.join(".git").exists())
            .map(Path::to_path_buf)
            .unwrap_or(dir);
        FsLoader { root }
    }
}

impl SourceLoader for FsLoader {
    fn load(&self, from: &str, path: &str) -> Result<(String, String), String> {
        let base = Path::new(from)
            .parent()
            .map(Path::to_path_buf)
            .unwrap_or_default();
        let joined = if base.as_os_str().is_empty() {
            PathBuf::from(path)
        } else {
            base.join(path)
        };
        let canonical = joined.canonicalize().map_err(|e| format!("{e}"))?;
        if !canonical.starts_with(&self.root) {
            return Err(format!(
                "it lies outside the project folder `{}`",
                self.root.display()
            ));
        }
        let text = std::fs::read_to_string(&canonical).map_err(|e| format!("{e}"))?;
        Ok((joined.display().to_string(), text))
    }
}

#[cfg(test)]
mod tests {
    use super::FsLoader;
    use caloris_compiler::{analyze, Analysis, Options};
    use std::path::{Path, PathBuf};

    /// A fresh project folder (with `.git`, so it is the root) inside a fresh scratch folder.
    fn project(tag: &str) -> (PathBuf, PathBuf) {
        let scratch =
            std::env::temp_dir().join(format!("caloris-loader-{tag}-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&scratch);
        let root = scratch.join("project");
        std::fs::create_dir_all(root.join(".git")).expect("scratch folder");
        (scratch, root)
    }

    fn write(path: &Path, text: &str) {
        std::fs::create_dir_all(path.parent().expect("parent")).expect("folder");
        std::fs::write(path, text).expect("write");
    }

    fn run(model: &Path) -> Analysis {
        let text = std::fs::read_to_string(model).expect("model");
        analyze(
            &model.display().to_string(),
            &text,
            &FsLoader::for_model(model),
            &Options::default(),
        )
    }

    const USES_WOOL: &str = "node a (fixed = 20 °C)\nnode b (fixed = 0 °C)\nlink w: a to b layer(wool, thickness = 100 mm, area = 1 m^2)\n";

    #[test]
    fn paths_are_relative_to_the_importing_file() {
        let (scratch, root) = project("relative");
        // Two files named materials.heat: the one beside the importer must win.
        write(
            &root.join("materials.heat"),
            "material wool (k = 1 W/(m*K))\n",
        );
        write(
            &root.join("rooms/materials.heat"),
            "material wool (k = 0.04 W/(m*K))\n",
        );
        write(&root.join("rooms/lib.heat"), "import \"materials.heat\"\n");
        write(
            &root.join("rooms/model.heat"),
            &format!("import \"lib.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("rooms/model.heat"));
        assert!(!a.has_errors(), "{:?}", a.diagnostics);
        let q = a.solution.expect("solves").heat_flows[0];
        assert!((q - 8.0).abs() < 1e-12, "{q}");
        let _ = std::fs::remove_dir_all(scratch);
    }

    #[test]
    fn nothing_outside_the_project_root_is_read() {
        let (scratch, root) = project("outside");
        write(
            &scratch.join("secret.heat"),
            "material wool (k = 0.04 W/(m*K))\n",
        );
        write(
            &root.join("model.heat"),
            &format!("import \"../secret.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("model.heat"));
        let d = a
            .diagnostics
            .iter()
            .find(|d| d.code == "E601")
            .expect("E601");
        assert!(d.message.contains("outside the project"), "{}", d.message);
        #[cfg(unix)]
        {
            // A link inside the project that points outside is refused as well.
            std::os::unix::fs::symlink(scratch.join("secret.heat"), root.join("alias.heat"))
                .expect("symlink");
            write(
                &root.join("model2.heat"),
                &format!("import \"alias.heat\"\n{USES_WOOL}"),
            );
            let a = run(&root.join("model2.heat"));
            assert!(
                a.diagnostics
                    .iter()
                    .any(|d| d.code == "E601" && d.message.contains("outside the project")),
                "{:?}",
                a.diagnostics
            );
        }
        let _ = std::fs::remove_dir_all(scratch);
    }

    #[test]
    fn import_cycles_are_reported() {
        let (scratch, root) = project("cycle");
        write(
            &root.join("a.heat"),
            "import \"b.heat\"\nmaterial wool (k = 0.04 W/(m*K))\n",
        );
        write(&root.join("b.heat"), "import \"a.heat\"\n");
        write(
            &root.join("model.heat"),
            &format!("import \"a.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("model.heat"));
        let d = a
            .diagnostics
            .iter()
            .find(|d| d.code == "E602")
            .expect("E602");
        assert!(
            d.message.contains("a.heat") && d.message.contains("b.heat"),
            "{}",
            d.message
        );
        let _ = std::fs::remove_dir_all(scratch);
    }

    #[test]
    fn a_missing_file_is_an_error_at_the_import() {
        let (scratch, root) = project("missing");
        write(
            &root.join("model.heat"),
            &format!("import \"nowhere.heat\"\n{USES_WOOL}"),
        );
        let a = run(&root.join("model.heat"));
        assert!(
            a.diagnostics.iter().any(|d| d.code == "E601"),
            "{:?}",
            a.diagnostics
        );
        let _ = std::fs::remove_dir_all(scratch);
    }
}
