"""Activity models for aqueous solutions (Pitzer equations for single salts)."""
