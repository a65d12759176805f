"""Records: the signed result workbook (write, read back, verify) and its content fingerprint."""
