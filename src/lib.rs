//! Kneepoint web app (placeholder until the browser issue lands).
