"""``GET /v1/sections``: catalog shapes with their key properties."""

from __future__ import annotations

from typing import Annotated, Any

import numpy as np
from fastapi import APIRouter, Query
from fastapi.responses import JSONResponse
from starlette.exceptions import HTTPException

from stanchion.engine import catalog
from stanchion.engine.sections import Kind
from stanchion.service.http.dependencies import AUTH
from stanchion.service.http.errors import FieldError
from stanchion.service.http.responses import errors
from stanchion.service.report_model import SectionList

router = APIRouter(tags=["catalog"], dependencies=AUTH)

#: Properties listed by ``GET /v1/sections`` and their units (catalog units).
SECTION_PROPERTIES: dict[str, str] = {
    "weight": "lb/ft", "A": "in2", "d": "in", "bf": "in", "tw": "in", "tf": "in",
    "Ix": "in4", "Iy": "in4", "rx": "in", "ry": "in", "J": "in4", "Cw": "in6",
}


def list_sections(family: str | None) -> dict[str, Any]:
    """Catalog rows of a family (all rows when None) with :data:`SECTION_PROPERTIES`.

    Raises:
        ValueError: ``family`` is not a family, family with depth or designation.
        LookupError: a valid family selects no shape.
    """
    table = catalog.load_catalog()
    if family is None:
        rows = np.arange(len(table))
    else:
        rows = catalog.family_indices(family)
        if len(rows) == 0:
            raise LookupError(f"no catalog shapes in family {family!r}")
    columns = {k: getattr(table, k)[rows].tolist() for k in SECTION_PROPERTIES}
    designations = table.designation[rows].tolist()
    families = table.family[rows].tolist()
    supported = (table.kind[rows] != Kind.UNSUPPORTED).tolist()
    shapes = []
    for i, name in enumerate(designations):
        row = {"designation": name, "family": families[i], "supported": supported[i]}
        # 0 in the catalog means "not tabulated for this family" (e.g. Cw of an HSS).
        row.update({k: (v[i] if v[i] != 0 else None) for k, v in columns.items()})
        shapes.append(row)
    return {"family": family, "count": len(shapes), "units": SECTION_PROPERTIES,
            "sections": shapes}


@router.get("/v1/sections", response_model=SectionList,
            responses=errors(401, 404, 422, _404="the family selects no catalog shape",
                             _422="not a family, family with depth or designation"),
            summary="Catalog shapes (AISC Shapes Database v16.0) with key properties")
def sections(family: Annotated[str | None, Query(
        max_length=40, description="family (W, HSS, PIPE ...), family with nominal depth "
        "(W14, HSS8) or a designation; all shapes when omitted")] = None) -> JSONResponse:
    """Shapes of a family, a family and depth, or one designation."""
    try:
        return JSONResponse(list_sections(family))
    except LookupError as exc:
        raise HTTPException(404, str(exc.args[0])) from None
    except ValueError as exc:
        raise FieldError(422, str(exc), "family") from None
