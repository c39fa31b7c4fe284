#!/usr/bin/env bash
# Loopback configuration shared by the start, dev and test commands. Expects PG_PORT, DB_NAME, APP_PORT and
# FAKE_BASE_PORT (five consecutive ports for the fakes, unless each FAKE_*_PORT is set). Only these URLs decide real or fake services.
export HOST=127.0.0.1
export PORT="$APP_PORT"
export APP_ORIGIN="http://127.0.0.1:$APP_PORT"
export DATABASE_URL="postgres://postgres@127.0.0.1:$PG_PORT/$DB_NAME"
export FAKE_OAUTH_PORT="${FAKE_OAUTH_PORT:-$((FAKE_BASE_PORT + 0))}"
export FAKE_MEILI_PORT="${FAKE_MEILI_PORT:-$((FAKE_BASE_PORT + 1))}"
export FAKE_DOI_PORT="${FAKE_DOI_PORT:-$((FAKE_BASE_PORT + 2))}"
export FAKE_SMTP_PORT="${FAKE_SMTP_PORT:-$((FAKE_BASE_PORT + 3))}"
export FAKE_MAILBOX_PORT="${FAKE_MAILBOX_PORT:-$((FAKE_BASE_PORT + 4))}"
export GITHUB_CLIENT_ID=chronometa-local
export GITHUB_CLIENT_SECRET=chronometa-local-secret
export GITHUB_AUTHORIZATION_URL="http://127.0.0.1:$FAKE_OAUTH_PORT/login/oauth/authorize"
export GITHUB_TOKEN_URL="http://127.0.0.1:$FAKE_OAUTH_PORT/login/oauth/access_token"
export GITHUB_USER_PROFILE_URL="http://127.0.0.1:$FAKE_OAUTH_PORT/api/user"
export GITHUB_USER_EMAIL_URL="http://127.0.0.1:$FAKE_OAUTH_PORT/api/user/emails"
export MEILI_HOST="http://127.0.0.1:$FAKE_MEILI_PORT"
export MEILI_API_KEY=chronometa-local-key
export DOI_RESOLVER_URL="http://127.0.0.1:$FAKE_DOI_PORT"
export SMTP_HOST=127.0.0.1
export SMTP_PORT="$FAKE_SMTP_PORT"
export MAILBOX_URL="http://127.0.0.1:$FAKE_MAILBOX_PORT"
export ADMIN_LOGINS="${ADMIN_LOGINS:-admin}"
export SESSION_SECRET="${SESSION_SECRET:-chronometa-local-session-secret-not-for-deployment}"
