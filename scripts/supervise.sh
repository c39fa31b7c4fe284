#!/usr/bin/env bash
# Source this file. `supervise NAME LOG CMD...` runs CMD in the background with its output appended to LOG and
# starts it again whenever it exits on its own (a crash), with a growing pause; `stop_supervised` stops them all.
# A process that keeps failing at once (5 starts within 60 s) is given up on and said so, while the others go on.

SUPERVISED=()

supervise() {
  local name="$1" log="$2"; shift 2
  (
    set +e
    child=""
    trap '[ -n "$child" ] && kill "$child" 2>/dev/null; wait 2>/dev/null; exit 0' TERM INT
    starts=()
    pause=1
    while true; do
      "$@" >>"$log" 2>&1 &
      child=$!
      wait "$child"
      rc=$?
      now=$(date +%s)
      starts+=("$now")
      recent=0
      for t in "${starts[@]}"; do [ $((now - t)) -lt 60 ] && recent=$((recent + 1)); done
      if [ "$recent" -ge 5 ]; then
        echo "[$name] stopped 5 times within a minute (last status $rc); not restarting it. See $log." >&2
        exit 1
      fi
      echo "[$name] exited with status $rc; restarting in ${pause} s (log: $log)" >&2
      sleep "$pause"
      pause=$((pause < 8 ? pause * 2 : 8))
    done
  ) &
  SUPERVISED+=($!)
}

stop_supervised() {
  local p
  for p in "${SUPERVISED[@]}"; do kill "$p" 2>/dev/null; done
  for p in "${SUPERVISED[@]}"; do wait "$p" 2>/dev/null; done
  SUPERVISED=()
}
