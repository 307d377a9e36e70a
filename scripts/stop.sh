#!/usr/bin/env bash
# npm run stop: stop the project's PostgreSQL clusters (development and test).
source "$(dirname "$0")/lib.sh"
for dir in "$DATA"/pg "$DATA"/pg-test; do stop_postgres "$dir"; done
