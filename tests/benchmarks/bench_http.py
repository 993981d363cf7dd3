"""HTTP service benchmark: prints numbers, asserts nothing.

Starts the real server (``python -m stanchion.service.cli serve``) on 127.0.0.1 with a
throw-away data folder and measures, in the same run on the same server:

1. requests/second of ``POST /v1/checks`` with a 100-member request next to ``GET
   /v1/health`` (target ratio checks/health >= 0.3), with one sequential client and with four
   client threads, and the server's own CPU time per request of each route (read from
   /proc), which gives the server's capacity whatever the client: the Python client on the
   same two cores limits the observed health rate, so the observed ratios flatter checks.
   The routes alternate in short windows; the ratio of each adjacent pair is printed too
   (min / median / max), which shows how much other load on the machine moved the numbers;
2. ``GET /v1/health`` latency p50 / p95 idle, then while a 20,000-column model job runs in its
   worker process (the model is generated here with ifcopenshell.api).

Usage: ``.venv/bin/python tests/benchmarks/bench_http.py [--columns 20000] [--seconds 6]``
"""

from __future__ import annotations

import argparse
import json
import os
import signal
import socket
import statistics
import subprocess
import sys
import tempfile
import threading
import time
from pathlib import Path

import httpx

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

SECTIONS = ["W14X48", "W14X53", "W14X61", "W14X68", "W14X82", "W14X90", "W12X40", "W12X53",
            "W10X33", "W10X49", "HSS8X8X1/2", "HSS6X6X3/8", "PIPE6STD", "W8X31", "W14X120"]


def members_request(n: int = 100) -> dict:
    """A deterministic request of ``n`` members with varied sections, lengths and loads."""
    members = []
    for i in range(n):
        members.append({
            "id": f"C-{i + 1}", "section": SECTIONS[i % len(SECTIONS)], "fy": 50,
            "length": 10 + (i % 9) * 1.5, "ky": 1.0 if i % 3 else 0.8,
            "loads": {"D": 40 + 3 * (i % 17), "L": 25 + 2 * (i % 11), "S": 5 + i % 7},
        })
    return {"design_method": "LRFD", "members": members}


# ----------------------------------------------------------------------------- model


def build_model(path: Path, n: int) -> Path:
    """An IFC4 model (inch / kip) of ``n`` W14X48 columns, 16 ft, loads D 95, L 60 kip.

    Built with ifcopenshell.api; the per-column entities that the api would create one call
    at a time (placement, extrusion) are created directly so that 20,000 columns take seconds.
    All columns share one Stanchion_Loads property set and one column type carrying the
    material profile set.
    """
    import ifcopenshell
    import ifcopenshell.api.aggregate
    import ifcopenshell.api.context
    import ifcopenshell.api.material
    import ifcopenshell.api.profile
    import ifcopenshell.api.pset
    import ifcopenshell.api.root
    import ifcopenshell.api.spatial
    import ifcopenshell.api.type
    import ifcopenshell.api.unit

    api = ifcopenshell.api
    f = ifcopenshell.file(schema="IFC4")
    project = api.root.create_entity(f, ifc_class="IfcProject", name="HTTP benchmark")
    api.unit.assign_unit(f, units=[api.unit.add_conversion_based_unit(f, name=u)
                                   for u in ("inch", "kip", "ksi")])
    model_ctx = api.context.add_context(f, context_type="Model")
    body = api.context.add_context(f, context_type="Model", context_identifier="Body",
                                   target_view="MODEL_VIEW", parent=model_ctx)
    site = api.root.create_entity(f, ifc_class="IfcSite", name="Site")
    building = api.root.create_entity(f, ifc_class="IfcBuilding", name="Building")
    storey = api.root.create_entity(f, ifc_class="IfcBuildingStorey", name="Level 1")
    api.aggregate.assign_object(f, products=[site], relating_object=project)
    api.aggregate.assign_object(f, products=[building], relating_object=site)
    api.aggregate.assign_object(f, products=[storey], relating_object=building)
    prof = api.profile.add_parameterized_profile(f, ifc_class="IfcIShapeProfileDef")
    # AISC Shapes Database v16.0, W14X48: d 13.8, bf 8.03, tw 0.340, tf 0.595 in
    prof.ProfileName, prof.OverallDepth, prof.OverallWidth = "W14X48", 13.8, 8.03
    prof.WebThickness, prof.FlangeThickness = 0.34, 0.595
    steel = api.material.add_material(f, name="A992", category="steel")
    mp = api.pset.add_pset(f, product=steel, name="Pset_MaterialSteel")
    api.pset.edit_pset(f, pset=mp, properties={
        "YieldStress": f.create_entity("IfcPressureMeasure", 50.0)})
    mset = api.material.add_material_set(f, name="W14X48", set_type="IfcMaterialProfileSet")
    api.material.add_profile(f, profile_set=mset, material=steel, profile=prof)
    ctype = api.root.create_entity(f, ifc_class="IfcColumnType", name="W14X48 column",
                                   predefined_type="COLUMN")
    api.material.assign_material(f, products=[ctype], type="IfcMaterialProfileSet",
                                 material=mset)
    origin = f.createIfcAxis2Placement3D(f.createIfcCartesianPoint((0.0, 0.0, 0.0)))
    up = f.createIfcDirection((0.0, 0.0, 1.0))
    cols = []
    for i in range(n):
        c = api.root.create_entity(f, ifc_class="IfcColumn", name=f"C{i + 1}",
                                   predefined_type="COLUMN")
        x, y = (i % 200) * 240.0, (i // 200) * 240.0
        c.ObjectPlacement = f.createIfcLocalPlacement(
            None, f.createIfcAxis2Placement3D(f.createIfcCartesianPoint((x, y, 0.0))))
        solid = f.createIfcExtrudedAreaSolid(prof, origin, up, 192.0)
        rep = f.createIfcShapeRepresentation(body, "Body", "SweptSolid", [solid])
        c.Representation = f.createIfcProductDefinitionShape(None, None, [rep])
        cols.append(c)
    api.spatial.assign_container(f, products=cols, relating_structure=storey)
    api.type.assign_type(f, related_objects=cols, relating_type=ctype,
                         should_map_representations=False)
    loads = api.pset.add_pset(f, product=cols[0], name="Stanchion_Loads")
    api.pset.edit_pset(f, pset=loads, properties={
        "D": f.create_entity("IfcForceMeasure", 95.0),
        "L": f.create_entity("IfcForceMeasure", 60.0)})
    rel = next(r for r in f.by_type("IfcRelDefinesByProperties")
               if r.RelatingPropertyDefinition == loads)
    rel.RelatedObjects = cols  # one shared property set
    f.write(str(path))
    return path


# ----------------------------------------------------------------------------- server


def _free_port() -> int:
    with socket.socket() as s:
        s.bind(("127.0.0.1", 0))
        return s.getsockname()[1]


class Server:
    """``stanchion serve`` in a child process on a free 127.0.0.1 port."""

    def __init__(self, data_dir: Path) -> None:
        self.port = _free_port()
        self.url = f"http://127.0.0.1:{self.port}"
        env = {k: v for k, v in os.environ.items() if not k.startswith("STANCHION_")}
        env.update(STANCHION_DATA_DIR=str(data_dir), STANCHION_JOB_TIMEOUT_S="900")
        self.log = (data_dir.parent / "server.log").open("wb")
        self.proc = subprocess.Popen(
            [sys.executable, "-m", "stanchion.service.cli", "serve", "--host", "127.0.0.1",
             "--port", str(self.port), "--no-access-log", "--log-level", "warning"],
            cwd=ROOT, env=env, stdout=self.log, stderr=subprocess.STDOUT)
        end = time.monotonic() + 30
        while time.monotonic() < end:
            if self.proc.poll() is not None:
                raise SystemExit("server exited: " + Path(self.log.name).read_text())
            try:
                if httpx.get(f"{self.url}/v1/health", timeout=1).status_code == 200:
                    return
            except httpx.TransportError:
                time.sleep(0.1)
        self.stop()
        raise SystemExit("server did not start in 30 s")

    def stop(self) -> None:
        self.proc.send_signal(signal.SIGINT)
        try:
            self.proc.wait(timeout=15)
        except subprocess.TimeoutExpired:
            self.proc.kill()
            self.proc.wait(timeout=5)
        self.log.close()


# ----------------------------------------------------------------------------- measuring


def rate(url: str, method: str, path: str, seconds: float, threads: int = 1,
         json_body: dict | None = None) -> float:
    """Successful requests per second over ``seconds`` with ``threads`` keep-alive clients.

    A JSON body is encoded once, up front: the client's encoding is not the server's cost.
    """
    content = json.dumps(json_body).encode() if json_body is not None else None
    headers = {"content-type": "application/json"} if content is not None else {}
    rates = [0.0] * threads
    errors = [0] * threads

    def loop(k: int) -> None:
        with httpx.Client(base_url=url, timeout=30) as c:
            for _ in range(5):  # warm up the connection and the route, untimed
                c.request(method, path, content=content, headers=headers)
            n, t0 = 0, time.monotonic()
            end = t0 + seconds
            while time.monotonic() < end:
                r = c.request(method, path, content=content, headers=headers)
                if r.status_code == 200:
                    n += 1
                else:
                    errors[k] += 1
            rates[k] = n / (time.monotonic() - t0)

    workers = [threading.Thread(target=loop, args=(k,)) for k in range(threads)]
    for w in workers:
        w.start()
    for w in workers:
        w.join(seconds + 60)
    if sum(errors):
        print(f"  ({sum(errors)} non-200 answers on {path})")
    return sum(rates)


def latencies(client: httpx.Client, until, max_seconds: float,
              pause: float = 0.02) -> list[float]:
    """Health latencies (ms) sampled until ``until()`` is true or ``max_seconds`` pass."""
    out: list[float] = []
    end = time.monotonic() + max_seconds
    while time.monotonic() < end and not until():
        t = time.perf_counter()
        client.get("/v1/health")
        out.append((time.perf_counter() - t) * 1000)
        time.sleep(pause)
    return out


def pct(values: list[float], q: float) -> float:
    """The q-th percentile (0-100) of ``values``."""
    if not values:
        return float("nan")
    return statistics.quantiles(values, n=100, method="inclusive")[int(q) - 1] if len(
        values) > 1 else values[0]


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--columns", type=int, default=20_000)
    p.add_argument("--seconds", type=float, default=6.0,
                   help="measuring time per route and client count (in 6 windows)")
    args = p.parse_args()
    with tempfile.TemporaryDirectory(prefix="stanchion-bench-") as tmp:
        tmp_path = Path(tmp)
        t = time.perf_counter()
        model = build_model(tmp_path / "columns.ifc", args.columns)
        print(f"model: {args.columns} columns, {model.stat().st_size / 1e6:.1f} MB, "
              f"built in {time.perf_counter() - t:.1f} s")
        server = Server(tmp_path / "data")
        try:
            run(server.url, model, args, server.proc.pid)
        finally:
            server.stop()


def server_cpu_seconds(pid: int) -> float:
    """User + system CPU time of the server process so far (Linux /proc)."""
    fields = Path(f"/proc/{pid}/stat").read_text().rsplit(")", 1)[1].split()
    return (int(fields[11]) + int(fields[12])) / os.sysconf("SC_CLK_TCK")


def run(url: str, model: Path, args: argparse.Namespace, pid: int) -> None:
    """The measurements against a running server."""
    body = members_request(100)
    with httpx.Client(base_url=url, timeout=60) as c:
        r = c.post("/v1/checks", json=body)
        s = r.json()["summary"] if r.status_code == 200 else r.text
        print(f"POST /v1/checks, 100 members: HTTP {r.status_code}, summary {s}")
    # Alternate short windows of each route so that load from other programs on the
    # machine falls on both alike; sum the windows.
    rounds = 6
    for threads in (1, 4):
        totals = {"health": [0.0, 0.0], "checks": [0.0, 0.0]}
        cpu = {"health": 0.0, "checks": 0.0}
        per_round: list[float] = []  # checks / health of each adjacent pair of windows
        for _ in range(rounds):
            pair = {}
            for name, method, path, payload in (("health", "GET", "/v1/health", None),
                                                ("checks", "POST", "/v1/checks", body)):
                window = args.seconds / rounds
                c0 = server_cpu_seconds(pid)
                pair[name] = rate(url, method, path, window, threads, payload)
                totals[name][0] += pair[name] * window
                cpu[name] += server_cpu_seconds(pid) - c0
                totals[name][1] += window
            per_round.append(pair["checks"] / pair["health"] if pair["health"] else 0.0)
        health = totals["health"][0] / totals["health"][1]
        checks = totals["checks"][0] / totals["checks"][1]
        # Server CPU per request: what one server process can serve per second, whatever
        # the client (a Python client on the same 2 cores limits the observed health rate).
        cap_h = totals["health"][0] / cpu["health"] if cpu["health"] else float("nan")
        cap_c = totals["checks"][0] / cpu["checks"] if cpu["checks"] else float("nan")
        what = ("four client threads; health is limited by the Python client here"
                if threads > 1 else "one sequential client")
        print(f"{threads} client thread(s): /v1/health {health:,.0f} req/s, /v1/checks "
              f"(100 members) {checks:,.0f} req/s, ratio {checks / health:.2f} ({what})")
        print(f"  ratio per pair of windows: min {min(per_round):.2f}, median "
              f"{statistics.median(per_round):.2f}, max {max(per_round):.2f} "
              f"({rounds} pairs)")
        print(f"  server CPU per request: health {1e3 / cap_h:.3f} ms, checks "
              f"{1e3 / cap_c:.3f} ms -> capacity {cap_h:,.0f} vs {cap_c:,.0f} req/s, "
              f"ratio {cap_c / cap_h:.2f}")

    with httpx.Client(base_url=url, timeout=60) as c:
        idle = latencies(c, lambda: False, 3.0)
        print(f"/v1/health idle: p50 {pct(idle, 50):.2f} ms, p95 {pct(idle, 95):.2f} ms "
              f"({len(idle)} samples)")
        t0 = time.monotonic()
        with model.open("rb") as fh:
            r = c.post("/v1/models", files={"file": (model.name, fh)})
        upload_s = time.monotonic() - t0
        if r.status_code != 202:
            print(f"upload refused: HTTP {r.status_code} {r.text}")
            return
        job_id = r.json()["job_id"]
        print(f"upload of {model.stat().st_size / 1e6:.1f} MB: HTTP 202 in {upload_s:.2f} s")
        state: dict = {}

        def finished() -> bool:
            job = c.get(f"/v1/jobs/{job_id}").json()
            state.update(job)
            return job["status"] in ("done", "failed")

        during: list[float] = []
        end = time.monotonic() + 900
        while time.monotonic() < end and not finished():
            during += latencies(c, lambda: False, 1.0)
        job_s = time.monotonic() - t0
        print(f"job: {state.get('status')} after {job_s:.1f} s; "
              f"{state.get('error') or state.get('summary')}")
        print(f"/v1/health while the job ran: p50 {pct(during, 50):.2f} ms, "
              f"p95 {pct(during, 95):.2f} ms, max {max(during, default=float('nan')):.1f} ms "
              f"({len(during)} samples)")
        if state.get("status") == "done":
            t = time.monotonic()
            r = c.get(f"/v1/jobs/{job_id}/model")
            print(f"checked model download: {len(r.content) / 1e6:.1f} MB in "
                  f"{time.monotonic() - t:.2f} s")


if __name__ == "__main__":
    main()
