#!/usr/bin/env bash
# Prints the demo sign-ins. The server's own list is the truth (it seeds them); the table below is
# the fallback when that command is not there, and matches the seeded scenario.
source "$(dirname "${BASH_SOURCE[0]}")/lib.sh"
cd "$ROOT"
app_env
if npm run --silent demo:users -w server 2>/dev/null; then exit 0; fi
cat <<'TXT'
  Demo sign-ins (every password: wingstage-demo)
    admin     Ruth Fennimore      admin@brackenfold.example
    manager   Declan Arbery       manager@brackenfold.example
    engineer  Priya Tollervey     priya@brackenfold.example
    engineer  Sam Quillon         sam@brackenfold.example
    accounts  Moira Kettleby      accounts@brackenfold.example
    owner     Gideon Harrowgate   gideon@owners.example      (Q-BRKA)
    owner     Elspeth Marlow      elspeth@owners.example     (Q-BRKE)
    owner     Tomasz Wrenfield    tomasz@owners.example      (Q-MRLW)
    owner     Hazel Brambury      group@owners.example       (Q-SALT, Saltmarsh Flyers Group)
TXT
