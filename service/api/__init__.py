"""HTTP routers and the concerns of the wire: admission and budget, middleware, security headers."""
