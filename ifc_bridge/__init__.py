"""IFC side of stanchion: models in (:mod:`ifc_bridge.read`), results out (``write``).

Reading (ifcopenshell 0.9, no geometry tessellation)::

    from stanchion.ifc_bridge.model import ModelReadError, open_model
    from stanchion.ifc_bridge.read import read_columns

    model = open_model("building.ifc")          # ModelReadError: one line, CLI exit 2
    table = read_load_table("loads.csv")        # optional; stanchion.service.load_table
    result = read_columns(model, include_members=False, loads_table=table)
    result.members        # engine.members.MemberTable in kip / inch / ksi, id = GlobalId
    result.messages       # model-level warnings
    result.force_unit_factor, result.length_unit_factor   # model unit -> kip / inch

Where each rule lives:

* :mod:`ifc_bridge.model` -- accepted files and schemas;
* :mod:`ifc_bridge.damage` -- what a lenient read let through and the elements it touches;
* :mod:`ifc_bridge.units` -- project units, undeclared-unit assumption and warnings;
* :mod:`ifc_bridge.elements` -- which elements are read, plan positions;
* :mod:`ifc_bridge.relations` -- one-pass relationship maps;
* :mod:`ifc_bridge.representation`, :mod:`ifc_bridge.profiles` -- Body / Axis and profiles;
* :mod:`ifc_bridge.sections` -- catalog agreement and sections from dimensions;
* :mod:`ifc_bridge.materials` -- yield stress precedence; grade names and product standards
  are matched by the engine (:mod:`engine.materials`);
* :mod:`ifc_bridge.lengths` -- member length sources;
* :mod:`ifc_bridge.properties` -- Stanchion_Design / Stanchion_Loads;
* :mod:`ifc_bridge.load_cases`, :mod:`ifc_bridge.loads` -- analysis results (the load-case
  policy itself is :mod:`engine.loads`), matching load-table rows to columns and source
  precedence.

Engineering rules (grades, tube design walls, load-case policy) live in the engine; this
package only extracts facts from the model.
"""
