"""Sample IFC models of an invented building (demo data) and their generator."""
