#!/usr/bin/env bash
# A one-node Slurm cluster on this machine, for the job-array integration test (test/slurm-cluster.test.ts).
#
#   bash .ci/slurm-setup.sh          install slurm-wlm and munge if missing, write the configuration, start
#                                    munged, slurmctld and slurmd, and wait until the node takes jobs
#   bash .ci/slurm-setup.sh stop     end the daemons this script started (by the process ids it recorded)
#   bash .ci/slurm-setup.sh status   print what sinfo and squeue say
#
# Safe to run again: a cluster that already answers is left as it is. Everything runs as root and without
# cgroups (process tracking by /proc, no task binding), because sandboxes often forbid cgroup control.
# State, spool, logs and pid files live under $SB_SLURM_STATE (default /var/spool/speedbound-slurm).
# The configuration is written to /etc/slurm/slurm.conf, the path Slurm's commands read by default, so the
# tests need no environment variable; a slurm.conf that this script did not write is never overwritten.
set -euo pipefail

STATE="${SB_SLURM_STATE:-/var/spool/speedbound-slurm}"
CONF_DIR=/etc/slurm
CONF="$CONF_DIR/slurm.conf"
MARK="# written by speedbound .ci/slurm-setup.sh"
WAIT_S="${SB_SLURM_WAIT_S:-60}"
MUNGE_RUN=/run/munge

say() { printf 'slurm-setup: %s\n' "$*" >&2; }
die() {
  say "FAILED: $*"
  exit 1
}

# Prints the last lines of a log so a failure explains itself in the CI output.
show_log() {
  local file="$1"
  if [[ -s "$file" ]]; then
    say "---- last lines of $file ----"
    tail -n 40 "$file" >&2 || true
    say "---- end of $file ----"
  else
    say "($file is empty or missing)"
  fi
}

# True when the pid file names a live process whose command is $2: a pid file left by a daemon that died
# (or by a machine that was restarted) may name an unrelated process by now.
alive() {
  local pid
  [[ -s "$1" ]] || return 1
  pid="$(cat "$1")"
  [[ "$pid" =~ ^[0-9]+$ ]] && [[ "$(cat "/proc/$pid/comm" 2>/dev/null)" == "$2" ]]
}

node_name() { hostname -s; }

# The node's state as sinfo reports it ("idle", "mixed", "down*", ...), or nothing when the controller is silent.
node_state() { timeout 5 sinfo -h -N -n "$(node_name)" -o %T 2>/dev/null | head -n 1 || true; }

usable() {
  case "$(node_state)" in
    idle | mixed | allocated | completing) return 0 ;;
    *) return 1 ;;
  esac
}

install_packages() {
  local missing=()
  command -v slurmctld >/dev/null 2>&1 || missing+=(slurm-wlm)
  command -v munged >/dev/null 2>&1 || missing+=(munge)
  if ((${#missing[@]})); then
    [[ $(id -u) -eq 0 ]] || die "need root to install ${missing[*]}"
    say "installing ${missing[*]} with apt-get"
    apt-get update -qq || die "apt-get update failed"
    DEBIAN_FRONTEND=noninteractive apt-get install -y -qq "${missing[@]}" >/dev/null || die "apt-get install ${missing[*]} failed"
  fi
}

start_munge() {
  mkdir -p "$MUNGE_RUN" /var/log/munge /var/lib/munge /etc/munge
  chown munge:munge "$MUNGE_RUN" /var/log/munge /var/lib/munge /etc/munge
  chmod 0755 "$MUNGE_RUN"
  chmod 0700 /etc/munge /var/log/munge /var/lib/munge
  if [[ ! -s /etc/munge/munge.key ]]; then
    say "creating a munge key"
    if command -v mungekey >/dev/null 2>&1; then
      runuser -u munge -- mungekey --create --keyfile=/etc/munge/munge.key
    else
      dd if=/dev/urandom of=/etc/munge/munge.key bs=1 count=1024 status=none
    fi
  fi
  chown munge:munge /etc/munge/munge.key
  chmod 0400 /etc/munge/munge.key
  if munge -n 2>/dev/null | unmunge >/dev/null 2>&1; then
    return 0 # a munged already answers (ours from an earlier call, or the system's)
  fi
  say "starting munged"
  runuser -u munge -- /usr/sbin/munged --pid-file="$MUNGE_RUN/munged.pid" || {
    show_log /var/log/munge/munged.log
    die "munged did not start"
  }
  cp "$MUNGE_RUN/munged.pid" "$STATE/munged.pid" 2>/dev/null || true
  local i
  for ((i = 0; i < 50; i++)); do
    if munge -n 2>/dev/null | unmunge >/dev/null 2>&1; then return 0; fi
    sleep 0.1
  done
  show_log /var/log/munge/munged.log
  die "munged runs but a credential does not round-trip (munge -n | unmunge)"
}

write_conf() {
  mkdir -p "$CONF_DIR" "$STATE/ctld" "$STATE/d" "$STATE/log"
  if [[ -e "$CONF" ]] && ! grep -qF "$MARK" "$CONF"; then
    say "$CONF exists and was not written by this script: using it as it is"
    return 0
  fi
  local host hw cpus boards sockets cores threads mem
  host="$(node_name)"
  # slurmd -C prints the hardware line Slurm itself detects; copying it avoids a node drained for a mismatch.
  hw="$(slurmd -C | head -n 1)" || die "slurmd -C failed"
  field() { sed -n "s/.*\\b$1=\\([0-9]*\\).*/\\1/p" <<<"$hw"; }
  cpus="$(field CPUs)"
  boards="$(field Boards)"
  sockets="$(field SocketsPerBoard)"
  cores="$(field CoresPerSocket)"
  threads="$(field ThreadsPerCore)"
  mem="$(field RealMemory)"
  [[ -n "$cpus" && -n "$mem" ]] || die "could not read CPUs and RealMemory from: $hw"
  local tmp="$CONF.tmp.$$"
  cat >"$tmp" <<EOF
$MARK
# One node on the loopback address, no accounting, no cgroups: enough to run job arrays for tests.
ClusterName=speedbound-ci
SlurmctldHost=$host(127.0.0.1)
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
MpiDefault=none
SwitchType=switch/none
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
SelectType=select/cons_tres
SelectTypeParameters=CR_Core
SchedulerType=sched/backfill
ReturnToService=2
MailProg=/bin/true
SlurmctldPort=6817
SlurmdPort=6818
StateSaveLocation=$STATE/ctld
SlurmdSpoolDir=$STATE/d
SlurmctldPidFile=$STATE/slurmctld.pid
SlurmdPidFile=$STATE/slurmd.pid
SlurmctldLogFile=$STATE/log/slurmctld.log
SlurmdLogFile=$STATE/log/slurmd.log
SlurmctldDebug=info
SlurmdDebug=info
SlurmctldTimeout=30
SlurmdTimeout=60
InactiveLimit=0
MinJobAge=300
KillWait=30
Waittime=0
NodeName=$host NodeAddr=127.0.0.1 CPUs=$cpus Boards=${boards:-1} SocketsPerBoard=${sockets:-1} CoresPerSocket=${cores:-$cpus} ThreadsPerCore=${threads:-1} RealMemory=$mem State=UNKNOWN
PartitionName=main Nodes=$host Default=YES MaxTime=INFINITE State=UP
EOF
  mv "$tmp" "$CONF"
  # No cgroup plugin is named above; an empty cgroup.conf keeps the daemons from reading a stale one.
  if [[ ! -e "$CONF_DIR/cgroup.conf" ]] || grep -qF "$MARK" "$CONF_DIR/cgroup.conf"; then
    printf '%s\n' "$MARK" >"$CONF_DIR/cgroup.conf"
  fi
}

start_daemons() {
  if ! alive "$STATE/slurmctld.pid" slurmctld; then
    # Keep one earlier log aside, so that a failure shows this start's lines only.
    [[ -e "$STATE/log/slurmctld.log" ]] && mv -f "$STATE/log/slurmctld.log" "$STATE/log/slurmctld.log.1"
    say "starting slurmctld"
    # -c: start without the saved jobs of an earlier cluster on this machine.
    slurmctld -c || {
      show_log "$STATE/log/slurmctld.log"
      die "slurmctld exited at start"
    }
  fi
  if ! alive "$STATE/slurmd.pid" slurmd; then
    [[ -e "$STATE/log/slurmd.log" ]] && mv -f "$STATE/log/slurmd.log" "$STATE/log/slurmd.log.1"
    say "starting slurmd"
    slurmd -N "$(node_name)" || {
      show_log "$STATE/log/slurmd.log"
      die "slurmd exited at start"
    }
  fi
}

wait_idle() {
  local deadline=$((SECONDS + WAIT_S)) state resumed=0
  while ((SECONDS < deadline)); do
    state="$(node_state)"
    case "$state" in
      idle | mixed | allocated | completing)
        say "node $(node_name) is $state"
        return 0
        ;;
      down* | drain* | fail*)
        # A node left down by an earlier run comes back once asked (its daemons are running now).
        if ((!resumed)); then
          timeout 5 scontrol update NodeName="$(node_name)" State=RESUME >/dev/null 2>&1 || true
          resumed=1
        fi
        ;;
    esac
    if ! alive "$STATE/slurmctld.pid" slurmctld; then
      show_log "$STATE/log/slurmctld.log"
      die "slurmctld stopped while the node was coming up"
    fi
    if ! alive "$STATE/slurmd.pid" slurmd; then
      show_log "$STATE/log/slurmd.log"
      die "slurmd stopped while the node was coming up"
    fi
    sleep 1
  done
  say "sinfo says: $(timeout 5 sinfo -N -l 2>&1 || true)"
  say "reason: $(timeout 5 scontrol show node "$(node_name)" 2>&1 | grep -i reason || true)"
  show_log "$STATE/log/slurmctld.log"
  show_log "$STATE/log/slurmd.log"
  die "node $(node_name) not idle after ${WAIT_S} s (state: '${state:-no answer}')"
}

stop_pidfile() {
  local name="$1" file="$2" pid i
  if alive "$file" "$name"; then
    pid="$(cat "$file")"
    say "stopping $name (pid $pid)"
    kill -TERM "$pid" 2>/dev/null || true
    for ((i = 0; i < 100; i++)); do
      kill -0 "$pid" 2>/dev/null || break
      sleep 0.1
    done
    if kill -0 "$pid" 2>/dev/null; then
      say "$name did not stop in 10 s; killing it"
      kill -KILL "$pid" 2>/dev/null || true
    fi
  fi
  rm -f "$file"
}

stop() {
  stop_pidfile slurmd "$STATE/slurmd.pid"
  stop_pidfile slurmctld "$STATE/slurmctld.pid"
  # munged only when this script started it (its pid was copied into our state folder then).
  if [[ -s "$STATE/munged.pid" ]] && [[ -s "$MUNGE_RUN/munged.pid" ]] && [[ "$(cat "$STATE/munged.pid")" == "$(cat "$MUNGE_RUN/munged.pid")" ]]; then
    stop_pidfile munged "$MUNGE_RUN/munged.pid"
  fi
  rm -f "$STATE/munged.pid"
}

start() {
  [[ $(id -u) -eq 0 ]] || die "run as root (the one-node cluster runs its daemons as root)"
  mkdir -p "$STATE"
  install_packages
  if alive "$STATE/slurmctld.pid" slurmctld && alive "$STATE/slurmd.pid" slurmd && usable; then
    say "cluster already up: node $(node_name) is $(node_state)"
    return 0
  fi
  start_munge
  write_conf
  start_daemons
  wait_idle
}

case "${1:-start}" in
  start) start ;;
  stop) stop ;;
  status)
    timeout 5 sinfo -N -l || true
    timeout 5 squeue || true
    ;;
  *) die "unknown action '$1' (start, stop or status)" ;;
esac
