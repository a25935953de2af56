"""Pydantic request and response models: the wire contract, with no physics in them."""
