//! `aggrade import`: a geologist's own table (CSV, TSV or TXT in any common delimiter, decimal
//! mark and encoding; `.xlsx` or `.ods`) into a project file, through the forgiving importer.
//! Prints how the file was read and the column mapping it used; on any problem it writes nothing.

use aggrade_core::io::import::{
    self, mapping_from_json, mapping_to_json, DecimalMark, Delimiter, ImportOptions, TextEncoding,
};
use aggrade_core::model::Project;
use anyhow::{anyhow, bail, Context};
use std::path::PathBuf;

/// Arguments of `aggrade import`.
#[derive(Debug, clap::Args)]
pub struct ImportArgs {
    /// The table to import: .csv, .tsv, .txt (any delimiter), .xlsx or .ods.
    pub input: PathBuf,
    /// Project file to write; an existing project gains the section (its old file kept as NAME.bak).
    #[arg(long, value_name = "OUT.aggrade")]
    pub out: PathBuf,
    /// Sheet of a workbook to read (default: the first).
    #[arg(long, value_name = "NAME")]
    pub sheet: Option<String>,
    /// The log is written from the top down: the rows are reversed (from/to are then depths).
    #[arg(long)]
    pub top_first: bool,
    /// A saved column mapping (JSON, as written by --save-mapping or the window) to use instead
    /// of matching the headers.
    #[arg(long, value_name = "MAP.json")]
    pub mapping: Option<PathBuf>,
    /// Save the mapping used, for next time.
    #[arg(long, value_name = "MAP.json")]
    pub save_mapping: Option<PathBuf>,
    /// Name of the new section (default: the file name without extension).
    #[arg(long, value_name = "NAME")]
    pub section: Option<String>,
    /// Cell delimiter of a text table: , ; | tab or space (default: detected).
    #[arg(long, value_name = "CHAR")]
    pub delimiter: Option<String>,
    /// Decimal mark of a text table: point or comma (default: detected).
    #[arg(long, value_name = "point|comma")]
    pub decimal: Option<String>,
    /// Encoding of a text table: utf-8, utf-16le, utf-16be or latin1 (default: detected).
    #[arg(long, value_name = "NAME")]
    pub encoding: Option<String>,
}

/// The reading options from the arguments; a bad value names the flag and what is valid.
fn options(args: &ImportArgs) -> anyhow::Result<ImportOptions> {
    let mut o = ImportOptions {
        sheet: args.sheet.clone(),
        top_first: args.top_first,
        section_name: args.section.clone(),
        ..Default::default()
    };
    if let Some(d) = &args.delimiter {
        o.text.delimiter = Some(Delimiter::parse(d).ok_or_else(|| {
            anyhow!("--delimiter {d:?}: give one character, or tab, space, comma, semicolon")
        })?);
    }
    if let Some(d) = &args.decimal {
        o.text.decimal = Some(match d.to_ascii_lowercase().as_str() {
            "point" | "." | "dot" => DecimalMark::Point,
            "comma" | "," => DecimalMark::Comma,
            _ => bail!("--decimal {d:?}: give point or comma"),
        });
    }
    if let Some(e) = &args.encoding {
        o.text.encoding = Some(
            TextEncoding::parse(e)
                .ok_or_else(|| anyhow!("--encoding {e:?}: give utf-8, utf-16le, utf-16be or latin1"))?,
        );
    }
    if let Some(path) = &args.mapping {
        let text =
            std::fs::read_to_string(path).with_context(|| format!("{}: could not read", path.display()))?;
        o.mapping = Some(mapping_from_json(&text).map_err(|e| anyhow!("{}: {e}", path.display()))?);
    }
    Ok(o)
}

/// Run `aggrade import`.
pub fn run(args: &ImportArgs) -> anyhow::Result<()> {
    let out = super::project_output(Some(&args.out), &args.input, "imported sections")?;
    let options = options(args)?;
    let imported = import::import_file(&args.input, &options)?;
    println!("read {} as {}", args.input.display(), imported.format.describe());
    println!("columns:");
    print!("{}", imported.mapping.describe());
    for w in &imported.warnings {
        eprintln!("aggrade: warning: {}: {w}", args.input.display());
    }
    let mut section = imported.section;
    let mut project = if out.exists() { super::load_input(&out)? } else { Project::new(Vec::new()) };
    while project.sections.iter().any(|s| s.name == section.name) {
        section.name.push_str(" (imported)");
    }
    println!(
        "imported {} beds ({:.2} m) as section {:?}",
        section.beds.len(),
        section.total_thickness_m(),
        section.name
    );
    project.sections.push(section);
    super::save_changed(&out, &project)?;
    if let Some(path) = &args.save_mapping {
        aggrade_core::io::write_bytes_atomic(path, mapping_to_json(&imported.mapping).as_bytes())?;
        eprintln!("saved the mapping to {}", path.display());
    }
    Ok(())
}
