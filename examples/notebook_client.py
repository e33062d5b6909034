#!/usr/bin/env python3
"""A notebook-style client of the beatforce service, standard library only.

Fetches a shipped scenario, runs a sweep of the yaw rate (CSV), prints the table, asks for the
sensing figures of the pair, then takes a measured stroke trace to a per-axis verdict (detected or
not, on which harmonic, with what strain). Usage:

    python3 examples/notebook_client.py [BASE_URL]

BASE_URL defaults to $BEATFORCE_URL, then http://127.0.0.1:8080 (start the service with `npm start`).
In a notebook, copy `call` and use it cell by cell.
"""
import csv
import io
import json
import os
import sys
import urllib.error
import urllib.request


def call(base, path, body=None, fmt="json"):
    """GET (body None) or POST a JSON document; return (parsed answer, response headers).

    fmt "csv" asks for the CSV table and returns a list of rows (dicts keyed by the header,
    whose names carry the units). Refusals raise SystemExit with the issues the service names.
    """
    data = None if body is None else json.dumps(body).encode("utf-8")
    headers = {"Accept": "text/csv" if fmt == "csv" else "application/json"}
    if data is not None:
        headers["Content-Type"] = "application/json"
    request = urllib.request.Request(base.rstrip("/") + path, data=data, headers=headers, method="GET" if data is None else "POST")
    try:
        with urllib.request.urlopen(request, timeout=60) as response:
            text = response.read().decode("utf-8")
            if fmt == "csv":
                return list(csv.DictReader(io.StringIO(text))), response.headers
            return json.loads(text), response.headers
    except urllib.error.HTTPError as error:
        answer = json.loads(error.read().decode("utf-8"))
        lines = [f"  {issue['path']}: {issue['message']}" for issue in answer.get("issues", [])]
        raise SystemExit(f"{path}: HTTP {error.code} {answer.get('error')}\n" + "\n".join(lines))
    except urllib.error.URLError as error:
        raise SystemExit(f"cannot reach {base}: {error.reason}; start the service with `npm start`")


def print_table(rows, columns):
    """Print rows (dicts) as aligned columns."""
    widths = [max(len(c), *(len(r[c]) for r in rows)) for c in columns]
    print("  ".join(c.rjust(w) for c, w in zip(columns, widths)))
    for r in rows:
        print("  ".join(r[c].rjust(w) for c, w in zip(columns, widths)))


def main():
    base = sys.argv[1] if len(sys.argv) > 1 else os.environ.get("BEATFORCE_URL", "http://127.0.0.1:8080")
    health, _ = call(base, "/health")
    print(f"beatforce {health['version']} at {base}")

    scenario, _ = call(base, "/api/v1/examples/fly-tilted-stroke")
    sweep = {
        "scenario": scenario,
        "vary": [{"field": "body.rate.yaw", "from": "-500 deg/s", "to": "500 deg/s", "steps": 11}],
        "outputs": [
            {"line": {"component": "coriolis", "axis": "normal", "order": 2, "organ": "specified"}, "name": "right_coriolis_normal_k2"},
            {"line": {"component": "coriolis", "axis": "normal", "order": 2, "organ": "mirror"}, "name": "left_coriolis_normal_k2"},
            {"line": {"component": "total", "axis": "normal", "order": 1}, "value": "phase", "name": "right_total_normal_k1_phase"},
        ],
    }
    rows, headers = call(base, "/api/v1/sweep", sweep, fmt="csv")
    print(f"sweep of body.rate.yaw, {len(rows)} points (input hash {headers['X-Input-Hash']})")
    print_table(rows, list(rows[0].keys()))

    sensing_scenario, _ = call(base, "/api/v1/examples/fly-sensing")
    answer, _ = call(base, "/api/v1/sensing", sensing_scenario)
    pair = answer["pair"]
    print(f"pair minimum detectable rate (rad/s), input hash {answer['inputHash']}:")
    for axis in ("roll", "pitch", "yaw"):
        print(f"  {axis}: {pair[axis]['minimumRate']}")

    # From a measured stroke trace to a verdict in one request: the digitised trace of the
    # measured-stroke example (fitted to harmonics by the service) on the stalk and strain gauge of
    # fly-sensing. Per body axis: is the scenario's rate detected, on which line, with what strain.
    measured, _ = call(base, "/api/v1/examples/measured-stroke")
    measured["organ"]["stalk"] = sensing_scenario["organ"]["stalk"]
    measured["sensor"] = sensing_scenario["sensor"]
    measured["output"] = {"series": False}
    verdict, _ = call(base, "/api/v1/sensing", measured)
    organ = verdict["organs"][0]
    print(f"measured stroke, {organ['side']} organ, {organ['read']['quantity']} at the stalk base ({verdict['path']} path):")
    for axis in ("roll", "pitch", "yaw"):
        a = organ["axes"][axis]
        line = a["channel"]
        seen = {True: "detectable", False: "not detectable", None: "no rate about this axis"}[a["detectable"]]
        print(f"  {axis}: {seen}; {line['axis']} line k={line['order']} ({line['frequency']:.0f} Hz), "
              f"signal {a['signal'] * 1e6:.4f} microstrain, SNR {a['snr']:.2f}")


if __name__ == "__main__":
    main()
