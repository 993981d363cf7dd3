"""Upper bounds of the members request's numbers (issue 13 item 5; docs/design.md §2).

Each bound is the engine's plausibility maximum (engine/plausibility.py, its sources there)
written in the request's unit that gives the largest number (Pa, mm, N), or our own stated
choice for what plausibility does not cover; the value at a bound is accepted, the next
representable number above it is refused whole, naming the field.  Unit factors: 1 ksi =
6,894,757.29 Pa, 1 in = 25.4 mm, 1 kip = 4,448.22 N (NIST SP 811, Appendix B.9).
"""

from __future__ import annotations

import copy
import json
import math
from pathlib import Path

import pytest
from pydantic import ValidationError

from stanchion.service import request
from stanchion.service.request import MembersRequest

ROOT = Path(__file__).resolve().parents[2]
MEMBER = {"id": "C1", "section": "W14X48", "fy": 50, "length": 16, "loads": {"D": 95.0}}


def _with(path: str, value: float) -> dict:
    """The §2 example request with ``value`` at ``path`` (dots; members.0.x, selection.x)."""
    body: dict = {"members": [copy.deepcopy(MEMBER)]}
    keys = path.split(".")
    where: dict | list = body
    for key in keys[:-1]:
        if isinstance(where, list):
            where = where[int(key)]
        else:
            where = where.setdefault(key, {})
    assert isinstance(where, dict)
    where[keys[-1]] = value
    return body


#: (field path, its bound, the bound's value by hand)
BOUNDS = [
    ("members.0.fy", request.MAX_STRESS_FY, 120 * 6_894_757.293168),  # 120 ksi in Pa
    ("E", request.MAX_STRESS_E, 34_800 * 6_894_757.293168),  # 34,800 ksi in Pa
    ("G", request.MAX_STRESS_E, 34_800 * 6_894_757.293168),
    ("members.0.length", request.MAX_LENGTH, 2_400 * 25.4),  # 200 ft in mm
    ("members.0.lx", request.MAX_LENGTH, 2_400 * 25.4),
    ("members.0.ly", request.MAX_LENGTH, 2_400 * 25.4),
    ("members.0.lz", request.MAX_LENGTH, 2_400 * 25.4),
    ("members.0.loads.D", request.MAX_FORCE, 100_000 * 4_448.2216152605),  # kip in N
    ("members.0.loads.W", request.MAX_FORCE, 100_000 * 4_448.2216152605),
    ("members.0.required_strength", request.MAX_FORCE, 100_000 * 4_448.2216152605),
    ("members.0.kx", request.MAX_K, 20.0),
    ("members.0.ky", request.MAX_K, 20.0),
    ("members.0.kz", request.MAX_K, 20.0),
    ("members.0.max_utilization", request.MAX_UTILIZATION, 10.0),
    ("selection.min_depth", request.MAX_NOMINAL_DEPTH, 120.0),
    ("selection.max_depth", request.MAX_NOMINAL_DEPTH, 120.0),
    ("selection.max_suggestions", 100, 100),
]


@pytest.mark.parametrize(("path", "bound", "by_hand"), BOUNDS)
def test_the_bound_is_accepted_and_above_it_refused(path: str, bound: float,
                                                     by_hand: float) -> None:
    assert bound == pytest.approx(by_hand, rel=1e-9)
    whole = path.endswith("max_suggestions")
    at = int(bound) if whole else bound
    MembersRequest.model_validate(_with(path, at))
    above = at + 1 if whole else math.nextafter(bound, math.inf)
    with pytest.raises(ValidationError) as err:
        MembersRequest.model_validate(_with(path, above))
    assert [".".join(map(str, e["loc"])) for e in err.value.errors()] == [path]


@pytest.mark.parametrize("path", ["members.0.loads.D", "members.0.required_strength"])
def test_forces_are_bounded_below_too(path: str) -> None:
    MembersRequest.model_validate(_with(path, -request.MAX_FORCE))
    with pytest.raises(ValidationError):
        MembersRequest.model_validate(_with(path, math.nextafter(-request.MAX_FORCE,
                                                                 -math.inf)))


@pytest.mark.parametrize("dim", ["d", "bf", "tw", "tf", "r"])
def test_profile_dimensions_are_bounded(dim: str) -> None:
    # 120 in in mm = 3,048 mm (the built-up depth limit of engine/plausibility.py)
    assert request.MAX_DIMENSION == pytest.approx(3048.0)
    profile = {"shape": "I", "unit": "mm", "d": 300.0, "bf": 200.0, "tw": 8.0, "tf": 12.0}
    member = {**MEMBER, "section": None, "profile": {**profile, dim: 3048.0}}
    MembersRequest.model_validate({"members": [member]})
    member["profile"] = {**profile, dim: math.nextafter(3048.0, math.inf)}
    with pytest.raises(ValidationError) as err:
        MembersRequest.model_validate({"members": [member]})
    assert [".".join(map(str, e["loc"])) for e in err.value.errors()] == [
        f"members.0.profile.{dim}"]


def test_combination_factors_are_bounded() -> None:
    body = {"members": [MEMBER], "combinations": [{"name": "c", "factors": {"D": 10.0}}]}
    MembersRequest.model_validate(body)
    body["combinations"][0]["factors"]["D"] = -10.5
    with pytest.raises(ValidationError) as err:
        MembersRequest.model_validate(body)
    assert [".".join(map(str, e["loc"])) for e in err.value.errors()] == [
        "combinations.0.factors.D"]


def test_the_issues_1e300_is_refused_naming_the_field() -> None:
    # issue 13: "fy": 1e300 was taken; it is implausible in every stress unit
    with pytest.raises(ValidationError) as err:
        MembersRequest.model_validate(_with("members.0.fy", 1e300))
    assert err.value.errors()[0]["loc"] == ("members", 0, "fy")


def _number_fields(schema: dict, defs: dict, path: str = "") -> dict[str, dict]:
    """Every number or integer of a JSON Schema, by path, with its constraints."""
    found: dict[str, dict] = {}
    if "$ref" in schema:
        return _number_fields(defs[schema["$ref"].split("/")[-1]], defs, path)
    for option in schema.get("anyOf", []):
        found.update(_number_fields(option, defs, path))
    if schema.get("type") in ("number", "integer"):
        found[path] = schema
    for key, sub in schema.get("properties", {}).items():
        found.update(_number_fields(sub, defs, f"{path}.{key}" if path else key))
    if isinstance(schema.get("additionalProperties"), dict):
        found.update(_number_fields(schema["additionalProperties"], defs, f"{path}.*"))
    if isinstance(schema.get("items"), dict):
        found.update(_number_fields(schema["items"], defs, f"{path}.0"))
    return found


def test_the_shipped_request_schema_shows_every_bound() -> None:
    shipped = json.loads((ROOT / "service" / "schemas" /
                          "members-request.schema.json").read_text())
    fields = _number_fields(shipped, shipped.get("$defs", {}))
    assert fields, "the schema must have number fields"
    unbounded = [p for p, s in fields.items() if "maximum" not in s]
    assert unbounded == []
    assert fields["members.0.fy"]["maximum"] == request.MAX_STRESS_FY
    assert fields["members.0.loads.*"]["minimum"] == -request.MAX_FORCE
    assert fields["selection.max_suggestions"]["maximum"] == 100


def test_over_http_a_number_over_its_bound_is_a_422_naming_it(tmp_path: Path) -> None:
    from fastapi.testclient import TestClient

    from stanchion.service.http.app import create_app
    from stanchion.service.http.settings import Settings

    with TestClient(create_app(Settings(data_dir=tmp_path / "data")),
                    raise_server_exceptions=False) as c:
        r = c.post("/v1/checks", json=_with("members.0.lx", 1e6))
        assert r.status_code == 422
        assert [d["loc"] for d in r.json()["details"]] == ["members.0.lx"]
        assert c.post("/v1/checks", json=_with("members.0.lx", 16)).status_code == 200
