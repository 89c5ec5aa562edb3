"""Write the derived catalog out: pages (Jinja2), charts, exports, store sheets, printouts.
Never reads entry files: it is handed the catalog and what was derived from it."""
