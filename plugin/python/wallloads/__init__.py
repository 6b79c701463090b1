"""WallLoads: surface loads from flow results (ParaView plugin companion package)."""
