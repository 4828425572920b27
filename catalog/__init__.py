"""Catalog input for picker: the user's crystal catalogs in, a part table of SI floats out.

Modules (each holds one idea):

- ``units``: the program's one pint registry; text -> SI float, SI float -> text.
- ``problems``: ``Problem`` (file, line, field, raw text, message, severity) and
  ``CatalogError`` (an input unusable as a whole).
- ``schema``: every catalog field as data (unit, aliases, checks) and the enumerations.
- ``headers``: the user's headers -> our fields (alias, unit in brackets, fuzzy
  suggestion, mapping file).
- ``textfile``, ``csv_reader``, ``yaml_reader``, ``rawtable``: bytes -> text -> a table
  of cell texts with line numbers, refusing hostile input.
- ``validate``, ``plausibility``: cells -> values, per-cell and per-part problems.
- ``reader``: ``load_catalogs`` (files and directories -> ``LoadResult``).
- ``lint``: ``lint_catalogs`` -> ``LintReport`` (JSON of DESIGN §6, exit code, text table).
- ``cache``: parsed-catalog cache around ``load_catalogs``.

Nothing here imports textual, rich or the ``picker`` package.
"""
