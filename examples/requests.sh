#!/usr/bin/env bash
# One curl line per route of the beatforce service. Usage:
#   bash examples/requests.sh [BASE_URL]      (default: $BEATFORCE_URL, then http://127.0.0.1:8080)
# Start the service first with `npm start`. Each call prints a header line and the first lines
# of the answer (for the repeated forces call, its headers); the last call shows a refusal (HTTP 400 with the issues).
set -euo pipefail
BASE="${1:-${BEATFORCE_URL:-http://127.0.0.1:8080}}"
HERE="$(cd "$(dirname "$0")" && pwd)"
OUT="$(mktemp)"
trap 'rm -f "$OUT"' EXIT

show() { # show TITLE: print the title and the first lines of the last answer
  echo "== $1"
  cut -c1-200 "$OUT" | sed -n '1,4p'
  echo
}

curl -fsS "$BASE/health" -o "$OUT"; show "GET /health"
curl -fsS "$BASE/api/v1/examples" -o "$OUT"; show "GET /api/v1/examples"
curl -fsS "$BASE/api/v1/examples/fly-tilted-stroke" -o "$OUT"; show "GET /api/v1/examples/fly-tilted-stroke"
curl -fsS "$BASE/api/v1/openapi.json" -o "$OUT"; show "GET /api/v1/openapi.json"

curl -fsS -X POST "$BASE/api/v1/forces" -H 'content-type: application/json' --data-binary "@$HERE/fly-tilted-stroke.json" -o "$OUT"; show "POST /api/v1/forces"
# The same request again: answered from the service's answer store (X-Answer-Cache: hit);
# add -H 'cache-control: no-cache' to have it computed afresh.
curl -fsS -X POST "$BASE/api/v1/forces" -H 'content-type: application/json' --data-binary "@$HERE/fly-tilted-stroke.json" -D - -o /dev/null | grep -i '^x-input-hash\|^x-answer-cache' > "$OUT"; show "POST /api/v1/forces again: its headers"
curl -fsS -X POST "$BASE/api/v1/forces?format=csv" -H 'content-type: application/json' --data-binary "@$HERE/fly-tilted-stroke.json" -o "$OUT"; show "POST /api/v1/forces?format=csv"
curl -fsS -X POST "$BASE/api/v1/sensing" -H 'content-type: application/json' -H 'accept: text/csv' --data-binary "@$HERE/fly-sensing.json" -o "$OUT"; show "POST /api/v1/sensing (Accept: text/csv)"
curl -fsS -X POST "$BASE/api/v1/turn?format=csv" -H 'content-type: application/json' --data-binary "@$HERE/fly-saccade.json" -o "$OUT"; show "POST /api/v1/turn?format=csv"

SWEEP='{"scenario": '"$(cat "$HERE/fly-tilted-stroke.json")"',
  "vary": [{"field": "body.rate.yaw", "from": "0 deg/s", "to": "1000 deg/s", "steps": 5}],
  "outputs": [{"line": {"component": "coriolis", "axis": "normal", "order": 2}}]}'
curl -fsS -X POST "$BASE/api/v1/sweep?format=csv" -H 'content-type: application/json' --data-binary "$SWEEP" -o "$OUT"; show "POST /api/v1/sweep?format=csv"

STATUS=$(curl -sS -X POST "$BASE/api/v1/forces" -H 'content-type: application/json' --data-binary '{"organ": {"mass": "12 mV"}}' -o "$OUT" -w '%{http_code}')
show "POST /api/v1/forces with an invalid scenario: HTTP $STATUS"
